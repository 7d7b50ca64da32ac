// Exact unit definitions. Sources: NIST Handbook 44 (current edition), Appendix C, "General Tables of
// Units of Measurement"; NIST SP 811 (2008), Appendix B. 16 CFR 500.19 (conversion of SI units) agrees for
// the inch and foot; for the fluid ounce it prints a rounded value, so the exact figure is cited to NIST.

/** 1 in = 25.4 mm exactly (international inch, 1959). NIST HB 44 App. C; NIST SP 811 App. B.8. */
export const MM_PER_INCH = 25.4;
/** 1 ft = 0.3048 m exactly. NIST HB 44 App. C; NIST SP 811 App. B.8. */
export const M_PER_FOOT = 0.3048;
/** 1 ft² = 0.09290304 m² exactly (0.3048²). NIST HB 44 App. C; NIST SP 811 App. B.8. */
export const M2_PER_FT2 = 0.09290304;
/** 1 US liquid gallon = 231 in³ exactly. NIST HB 44 App. C. */
export const IN3_PER_US_GALLON = 231;
/** 1 US gallon = 3.785411784 L exactly (231 × 25.4³ mm³). NIST HB 44 App. C; NIST SP 811 App. B.8. */
export const L_PER_US_GALLON = 3.785411784;
/**
 * 1 US fluid ounce = 1/128 US gallon = 29.5735295625 mL exactly. NIST HB 44 App. C; NIST SP 811 App. B.
 * (16 CFR 500.19 gives a rounded figure for labels; the exact value is NIST's.)
 */
export const ML_PER_US_FL_OZ = 29.5735295625;
/** 1 mile (international) = 5280 ft = 1.609344 km exactly (5280 × 0.3048 m). NIST HB 44 App. C; NIST SP 811 App. B.8. */
export const KM_PER_MILE = 1.609344;

export const mmToInches = (mm: number): number => mm / MM_PER_INCH;
export const inchesToMm = (inches: number): number => inches * MM_PER_INCH;
export const m2ToFt2 = (m2: number): number => m2 / M2_PER_FT2;
export const ft2ToM2 = (ft2: number): number => ft2 * M2_PER_FT2;
export const mlToUsFlOz = (ml: number): number => ml / ML_PER_US_FL_OZ;
export const usFlOzToMl = (flOz: number): number => flOz * ML_PER_US_FL_OZ;
/** Coverage: m² per litre → ft² per US gallon (× L/US gal ÷ m²/ft²), the figure US labels print. */
export const m2PerLToFt2PerUsGal = (m2PerL: number): number => (m2PerL / M2_PER_FT2) * L_PER_US_GALLON;
export const ft2PerUsGalToM2PerL = (ft2PerGal: number): number => (ft2PerGal * M2_PER_FT2) / L_PER_US_GALLON;
