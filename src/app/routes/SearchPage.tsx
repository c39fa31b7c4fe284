import { SearchPanel } from '../../features/search/components/SearchPanel';

export function SearchPage() {
  return (
    <>
      <h1>Search references</h1>
      <SearchPanel />
    </>
  );
}
