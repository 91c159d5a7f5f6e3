// The NLM UCUM library ships no type declarations; src/ingest/units.ts types the few calls it makes.
declare module '@lhncbc/ucum-lhc' {
  const ucum: unknown;
  export default ucum;
}
