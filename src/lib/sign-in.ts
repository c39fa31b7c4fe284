/** Where the sign-in link goes: the OAuth start, returning to the current page afterwards. */
export const signInHref = (returnTo = window.location.pathname + window.location.search) =>
  `/auth/github?returnTo=${encodeURIComponent(returnTo)}`;
