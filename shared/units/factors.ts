// Exact definitional factors. Sources: NIST Handbook 44 (Appendix C, General Tables of Units of
// Measurement) and NIST SP 811 (2008), Appendix B. Each factor is built from its definition rather
// than typed as a rounded decimal, so the chain of definitions stays visible.

/** International inch in millimetres (1959 international yard and pound agreement): 25.4 mm exactly. */
export const INCH_MM = 25.4;
/** International foot in millimetres: 12 in = 304.8 mm exactly. */
export const FOOT_MM = 12 * INCH_MM;
/** US liquid gallon in litres: 231 in³ exactly = 3.785411784 L. */
export const US_GALLON_L = (231 * INCH_MM ** 3) / 1e6;
/** Imperial (UK) gallon in litres: 4.54609 L exactly (UK Weights and Measures Act 1985). */
export const IMPERIAL_GALLON_L = 4.54609;
/** Standard acceleration of gravity in m/s²: 9.80665 exactly (3rd CGPM 1901; NIST SP 330). */
export const STANDARD_GRAVITY_M_S2 = 9.80665;
/** Avoirdupois pound in kilograms: 0.45359237 kg exactly. */
export const POUND_KG = 0.45359237;
/** Pound-force per square inch in kPa: 0.45359237 kg × 9.80665 m/s² / (0.0254 m)² = 6.894757293168… kPa. */
export const PSI_KPA = (POUND_KG * STANDARD_GRAVITY_M_S2) / (INCH_MM / 1000) ** 2 / 1000;
/** Bar in kPa: 100 kPa exactly. */
export const BAR_KPA = 100;
/** Conventional metre of water in kPa: 1000 kg/m³ × 9.80665 m/s² × 1 m = 9.80665 kPa exactly. */
export const METRE_WATER_KPA = STANDARD_GRAVITY_M_S2;
/** Conventional inch of water in kPa: 0.0254 m × 9.80665 kPa/m = 0.24908891 kPa exactly. */
export const INCH_WATER_KPA = (INCH_MM / 1000) * METRE_WATER_KPA;
