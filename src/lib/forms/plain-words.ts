/** The one wording of zod's checks for people, shared with the server (shared/schemas/plain-words.ts). */
export { plainWords, fieldInWords, fieldProblemInWords } from '../../../shared/schemas/plain-words';
