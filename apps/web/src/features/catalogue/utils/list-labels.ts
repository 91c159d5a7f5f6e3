import type { CatalogueList } from '@plumbline/contracts';
import type { CatalogueItem } from '../api/catalogue-keys.ts';

/** How each list is named on screen, and one line on what it holds. */
export const catalogueListLabels: Record<
  CatalogueList,
  { title: string; singular: string; description: string }
> = {
  analytes: {
    title: 'Analytes',
    singular: 'analyte',
    description:
      'What is measured: LOINC code, canonical UCUM unit (values are stored in it), display decimals and total allowable error with its source.',
  },
  methods: {
    title: 'Methods',
    singular: 'method',
    description:
      'Measurement methods and their principle; procedures sharing analyte and method form the method tier.',
  },
  'instrument-models': {
    title: 'Instrument models',
    singular: 'instrument model',
    description:
      'Analyser models in use across the network; the instrument tier groups procedures on the same model.',
  },
  reagents: {
    title: 'Reagents',
    singular: 'reagent',
    description: 'Reagent kits; together with instrument model and method they make a procedure’s peer key.',
  },
  'control-materials': {
    title: 'Control materials',
    singular: 'control material',
    description: 'The quality-control materials labs run; each has lots with their own levels and expiry.',
  },
  'control-lots': {
    title: 'Control lots',
    singular: 'control lot',
    description:
      'Lots of each control material, with their levels and expiry dates. Lot numbers are unique across the network.',
  },
};

/** The code or lot number that names an entry in messages. */
export function entryName(item: CatalogueItem): string {
  return 'lotNumber' in item ? item.lotNumber : item.code;
}
