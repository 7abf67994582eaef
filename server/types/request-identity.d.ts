import type { Logger } from "pino";

// What server/http/request-log.ts (identifyRequest) gives every request.
declare module "http" {
  interface IncomingMessage {
    /** This process's number for the request (1, 2, 3 …), on every log line written for it. */
    id: number;
    /** The app's logger with the request's id bound. */
    log: Logger;
  }
}
