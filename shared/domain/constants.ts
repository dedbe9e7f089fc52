/**
 * Speed of light in vacuum, m/s. Exact by definition of the metre
 * (BIPM, SI Brochure 9th ed., SI base unit "metre"). Never use 3e8: that is 0.069 % off.
 */
export const SPEED_OF_LIGHT_M_PER_S = 299_792_458;
