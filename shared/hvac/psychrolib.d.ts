// psychrolib ships no types; only the calls used here are declared.
declare module 'psychrolib' {
  interface Psychrometrics {
    readonly IP: number;
    readonly SI: number;
    SetUnitSystem(unitSystem: number): void;
    GetStandardAtmPressure(altitude: number): number;
    GetTWetBulbFromRelHum(tDryBulb: number, relHum: number, pressure: number): number;
    GetTDewPointFromRelHum(tDryBulb: number, relHum: number): number;
    GetRelHumFromTWetBulb(tDryBulb: number, tWetBulb: number, pressure: number): number;
    GetHumRatioFromTWetBulb(tDryBulb: number, tWetBulb: number, pressure: number): number;
    GetHumRatioFromRelHum(tDryBulb: number, relHum: number, pressure: number): number;
    GetTDewPointFromTWetBulb(tDryBulb: number, tWetBulb: number, pressure: number): number;
  }
  const psychrolib: Psychrometrics & { constructor: new () => Psychrometrics };
  export default psychrolib;
}
