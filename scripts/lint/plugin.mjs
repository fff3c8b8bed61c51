// The project's own lint rules, loaded as a local ESLint plugin by eslint.config.mjs.
import noClientImport from './no-client-import.mjs';
import ownTables from './own-tables.mjs';

export default {
  meta: { name: 'seasonwell' },
  rules: { 'own-tables': ownTables, 'no-client-import': noClientImport },
};
