// psychrolib 1.1.1 ships no types; the test uses these two calls
declare module 'psychrolib' {
  interface Psychrolib {
    readonly SI: 2;
    readonly IP: 1;
    SetUnitSystem(unitSystem: 1 | 2): void;
    GetSatVapPres(tDryBulbC: number): number;
  }
  const psychrolib: Psychrolib;
  export default psychrolib;
}
