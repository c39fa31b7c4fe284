/** What a message for people must never hold: schema paths, zod's own wording, API syntax. */
const PATH_LIKE: Array<[string, RegExp]> = [
  ['a server path', /\b(body|query|path)\.\w/],
  ['an indexed path', /\b[A-Za-z_]+\.\d+\b/],
  ['a dotted field path', /\b[a-z]+\.[a-z]+[A-Z]\w*|\b[a-z]+[A-Z]\w*\.[a-z]/],
  ['a camelCase field name', /\b[a-z]+[A-Z][a-zA-Z]*\b/],
  ["zod's wording", /expected \w+, received|Invalid (input|option|discriminator|enum|type|string|key|element)|Too (small|big)|Unrecognized key|Expected '/i],
  ['a comparison sign', /[<>]=|[<>]\d/],
  ['a JSON fragment', /[{}[\]]/],
];
/** Which kinds of path-like text a message holds (empty when it is words for people). */
export const pathLikeIn = (message: string) => PATH_LIKE.filter(([, re]) => re.test(message)).map(([what]) => what);
