import { createRequire } from 'node:module';

// jsdom is the reference HTML parser (parsed the way a browser would). The project has no
// @types/jsdom and the server tsconfig has no DOM lib, so describe just what the tests read.
export interface Node_ {
  textContent: string | null;
  value?: string;
  style: { fontFamily: string };
  nextElementSibling: Node_ | null;
  getAttribute(name: string): string | null;
  querySelector(selector: string): Node_ | null;
  querySelectorAll(selector: string): ArrayLike<Node_> & Iterable<Node_> & { length: number };
}
export interface Doc extends Node_ {
  title: string;
  body: Node_;
}
const { JSDOM } = createRequire(import.meta.url)('jsdom') as { JSDOM: new (html: string) => { window: { document: Doc } } };

export const parse = (html: string): Doc => new JSDOM(html).window.document;
