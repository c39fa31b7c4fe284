import { Link } from 'react-router-dom';

export function NotFoundPage() {
  return (
    <div>
      <h1>Nothing here</h1>
      <p>
        This address does not match any page. <Link to="/">Back to the start</Link>.
      </p>
    </div>
  );
}
