// Neither package ships type declarations and no @types package exists for the versions we pin;
// these cover only what the local stand-ins call.

declare module 'oidc-provider' {
  import type { IncomingMessage, ServerResponse } from 'node:http';

  export interface InteractionDetails {
    uid: string;
    returnTo: string;
    grantId?: string;
    prompt: { name: string; reasons: string[]; details: Record<string, unknown> };
    params: Record<string, unknown> & { client_id?: string; scope?: string };
    session?: { accountId?: string; uid?: string };
  }

  export interface Grant {
    accountId: string;
    clientId: string;
    addOIDCScope(scope: string): void;
    addOIDCClaims(claims: string[]): void;
    addResourceScope(resource: string, scope: string): void;
    save(): Promise<string>;
  }

  export interface KoaLikeContext {
    body: unknown;
    type: string;
    status: number;
    host: string;
    [key: string]: unknown;
  }

  export class Provider {
    constructor(issuer: string, configuration?: Record<string, unknown>);
    issuer: string;
    callback(): (req: IncomingMessage, res: ServerResponse) => void;
    interactionDetails(req: IncomingMessage, res: ServerResponse): Promise<InteractionDetails>;
    interactionFinished(
      req: IncomingMessage,
      res: ServerResponse,
      result: Record<string, unknown>,
      options?: { mergeWithLastSubmission?: boolean },
    ): Promise<void>;
    Grant: {
      new (properties: { accountId: string; clientId: string }): Grant;
      find(id: string): Promise<Grant | undefined>;
    };
    on(event: string, listener: (...args: unknown[]) => void): this;
  }

  export default Provider;
}

declare module 's3rver' {
  interface S3rverOptions {
    address?: string;
    port?: number;
    silent?: boolean;
    directory?: string;
    resetOnClose?: boolean;
    allowMismatchedSignatures?: boolean;
    vhostBuckets?: boolean;
    configureBuckets?: Array<{ name: string; configs?: Array<string | Buffer> }>;
  }

  export default class S3rver {
    constructor(options?: S3rverOptions);
    run(): Promise<{ address: string; port: number }>;
    close(): Promise<void>;
    httpServer?: import('node:http').Server;
  }
}
