declare module "psychrolib" {
  const psychrolib: {
    SI: number;
    IP: number;
    SetUnitSystem(system: number): void;
    /** saturation vapour pressure over liquid water, Pa (SI) from dry-bulb temperature, °C */
    GetSatVapPres(temperatureC: number): number;
  };
  export default psychrolib;
}
