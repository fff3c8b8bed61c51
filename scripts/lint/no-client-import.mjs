// Nothing in server/ imports the Angular client in src/ (static, dynamic, or re-exported).
import { dirname, resolve, sep } from 'node:path';

const ROOT = resolve(import.meta.dirname, '..', '..');
const SERVER = resolve(ROOT, 'server');
const CLIENT = resolve(ROOT, 'src');

export default {
  meta: {
    type: 'problem',
    docs: { description: 'forbid server/ importing the Angular client in src/' },
    messages: { client: 'server/ must not import the Angular client ({{source}}); move what both need to shared/.' },
    schema: [],
  },
  create(context) {
    const filename = context.filename;
    if (!filename.startsWith(SERVER + sep)) return {};
    function check(sourceNode) {
      if (!sourceNode || sourceNode.type !== 'Literal' || typeof sourceNode.value !== 'string') return;
      const source = sourceNode.value;
      if (!source.startsWith('.')) return;
      const target = resolve(dirname(filename), source);
      if (target === CLIENT || target.startsWith(CLIENT + sep)) context.report({ node: sourceNode, messageId: 'client', data: { source } });
    }
    return {
      ImportDeclaration: (node) => check(node.source),
      ExportNamedDeclaration: (node) => check(node.source),
      ExportAllDeclaration: (node) => check(node.source),
      ImportExpression: (node) => check(node.source),
    };
  },
};
