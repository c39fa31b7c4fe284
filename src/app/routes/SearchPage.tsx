import { CURRENT_VOCABULARY, useManipulations } from '../../features/manipulations/api/get-manipulations';
import { SearchPanel } from '../../features/search/components/SearchPanel';

export function SearchPage() {
  const { data } = useManipulations(CURRENT_VOCABULARY);
  return (
    <>
      <h1>Search references</h1>
      <SearchPanel manipulations={data?.items.map((m) => ({ term: m.term, label: m.label })) ?? []} />
    </>
  );
}
