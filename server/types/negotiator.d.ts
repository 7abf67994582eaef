// negotiator 1.x (the version Express 5 itself uses): only what compress-answer.ts calls. @types/negotiator describes
// 0.6, whose encoding() takes no preferred order.
declare module "negotiator" {
  import type { IncomingMessage } from "node:http";
  export default class Negotiator {
    constructor(request: Pick<IncomingMessage, "headers">);
    encoding(available?: string[], options?: { preferred?: string[] }): string | undefined;
  }
}
