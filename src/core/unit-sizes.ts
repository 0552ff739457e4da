/** Standard low-voltage capacitor unit sizes, kvar (common practice list, no single source). */
export const STANDARD_UNIT_KVAR = [2.5, 5, 7.5, 10, 12.5, 15, 20, 25, 30, 40, 50, 60, 75, 100] as const;
