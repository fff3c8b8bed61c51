// A feature under server/<feature>/ writes (insert, update, delete) only the tables it owns, and
// calls the owning feature's service for the rest. Reads and joins across features are allowed.
import { dirname, relative, resolve, sep } from 'node:path';
import { NOT_FEATURES, SCHEMA_DIR, SHARED_WRITERS, tableOwners } from './tables.mjs';

const SERVER = resolve(SCHEMA_DIR, '..', '..');
const WRITES = new Set(['insert', 'update', 'delete']);

/** The feature folder a file belongs to, or null outside server/<feature>/. */
function featureOf(filename) {
  const rel = relative(SERVER, filename);
  if (rel.startsWith('..')) return null;
  const parts = rel.split(sep);
  if (parts.length < 2 || NOT_FEATURES.has(parts[0])) return null;
  return parts[0];
}

function isSchemaImport(filename, source) {
  if (!source.startsWith('.')) return false;
  const target = resolve(dirname(filename), source.replace(/\.js$/, ''));
  return target === SCHEMA_DIR || target.startsWith(SCHEMA_DIR + sep);
}

export default {
  meta: {
    type: 'problem',
    docs: { description: "forbid a server feature writing another feature's tables" },
    messages: {
      foreign: "{{feature}} writes {{table}}, which {{owner}} owns: call the {{owner}} feature's service instead.",
    },
    schema: [],
  },
  create(context) {
    const filename = context.filename;
    const feature = featureOf(filename);
    if (!feature) return {};
    const owners = tableOwners();
    /** local name → table export name, for named imports from the schema */
    const tables = new Map();
    /** local names of `import * as schema` from the schema */
    const namespaces = new Set();

    function tableName(node) {
      if (node.type === 'Identifier') return tables.get(node.name) ?? null;
      if (node.type === 'MemberExpression' && !node.computed && node.object.type === 'Identifier' && namespaces.has(node.object.name)) {
        return node.property.name;
      }
      return null;
    }

    return {
      ImportDeclaration(node) {
        if (!isSchemaImport(filename, String(node.source.value))) return;
        for (const s of node.specifiers) {
          if (s.type === 'ImportSpecifier') tables.set(s.local.name, s.imported.type === 'Identifier' ? s.imported.name : String(s.imported.value));
          else namespaces.add(s.local.name);
        }
      },
      CallExpression(node) {
        const callee = node.callee;
        if (callee.type !== 'MemberExpression' || callee.computed || !WRITES.has(callee.property.name)) return;
        const arg = node.arguments[0];
        if (!arg) return;
        const table = tableName(arg);
        if (!table || !owners.has(table)) return;
        const owner = owners.get(table);
        if (owner === feature || SHARED_WRITERS[table]?.includes(feature)) return;
        context.report({ node: arg, messageId: 'foreign', data: { feature, table, owner } });
      },
    };
  },
};
