import type { Role } from '../shared/roles.js';

declare global {
  namespace Express {
    interface User {
      id: number;
      login: string;
      name: string | null;
      email: string | null;
      roles: Role[];
      via: 'session' | 'token';
      /** The Bearer token the request came with (via 'token' only). */
      tokenId?: number;
    }
  }
}

export {};
