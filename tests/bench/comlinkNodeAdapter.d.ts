// Types for comlink's Node adapter: its .d.ts sits beside node-adapter.min.js, not the .mjs we import.
declare module "comlink/dist/esm/node-adapter.mjs" {
  import type { Endpoint } from "comlink";
  export interface NodeEndpoint {
    // biome-ignore lint/suspicious/noExplicitAny: Worker and MessagePort take different transfer lists
    postMessage(message: any, transfer?: any): void;
    // biome-ignore lint/suspicious/noExplicitAny: matches both Worker and MessagePort listener signatures
    on(type: string, listener: (...args: any[]) => void): unknown;
    // biome-ignore lint/suspicious/noExplicitAny: as above
    off(type: string, listener: (...args: any[]) => void): unknown;
    start?: () => void;
  }
  export default function nodeEndpoint(nep: NodeEndpoint): Endpoint;
}
