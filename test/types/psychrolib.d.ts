/** The parts of psychrolib (ASHRAE psychrometrics, reference library) the tests use; it ships no types. */
declare module 'psychrolib' {
  const psychrolib: {
    SI: number;
    SetUnitSystem: (unit: number) => void;
    GetTDewPointFromVapPres: (tDryBulbC: number, vapPresPa: number) => number;
    GetSatVapPres: (tDryBulbC: number) => number;
  };
  export default psychrolib;
}
