// Words for the readings whose meaning is easy to mistake, apart from the engine in evaluate.ts
// (which re-exports them), so a form shows them without loading the engine.

/** Help text for readings whose meaning is easy to mistake. */
export const READING_HELP: Readonly<Record<string, string>> = {
  compressorRatedLoadAmps:
    'RLA is a rating, not the current the compressor is expected to draw: it sizes wiring and protection (UL 1995 sets it at the maximum continuous current ÷ 1.56, from memory). A healthy compressor usually runs below it, and its current moves with the load.',
  airflowBasis: 'Standard CFM is air at sea-level density, as blower tables state it; actual CFM is what a flow hood reads at the home. At elevation the two differ.',
  totalExternalStaticInWc: 'Total external static pressure: supply plus return static, measured at the cabinet, in inches of water column.',
  maxExternalStaticInWc: 'The maximum external static pressure on the nameplate or in the blower table; 0.5 in. w.c. is assumed when left blank.',
  flueCoAirFreePpm: 'Carbon monoxide in the flue products, corrected to air-free, after the burner has run 5 minutes or more.',
  ambientCoPpm: "Carbon monoxide in the living space, measured before and during the appliance's run.",
  compressorHz: "The compressor's running frequency, from the unit's display or the maker's service tool.",
  maxCompressorHz: "The model's maximum compressor frequency, from the nameplate or the maker's data.",
  capacityPct: 'Percent of full capacity, where the unit or its tool shows it; otherwise it is worked out from the frequency.',
  fullCapacityTest: 'Most variable-speed systems have a test or charge mode that holds the compressor at full capacity. The charge is judged only there.',
};
