/** Export is a download: the browser follows the link, so there is no query here, only the address. */
export const exportHref = (ids: number[], format: 'bibtex' | 'csl-json') => `/api/references/export?format=${format}&ids=${ids.join(',')}`;
