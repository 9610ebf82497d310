/**
 * The precision a measurement would really have at a site: a zenith value for a reference seeing,
 * scaled with the seeing the site has there and then. Seeing grows with airmass as X^0.6 (Roddier,
 * "The effects of atmospheric turbulence in optical astronomy", Progress in Optics 19, 1981; from
 * memory), and both the astrometric and the radial-velocity σ are taken proportional to the image
 * FWHM (a centroid's error scales with the image size at fixed signal-to-noise, and the light a
 * slit or fibre loses grows with it; common practice, no source). The model is stated in every
 * plan line through the σ it gives.
 */
import { DEFAULT_ZENITH_SIGMA } from '../../../descriptors/measurement-kinds.ts';
import { InputError } from '../errors.ts';
import { positive } from './checks.ts';
import type { Precision } from './information.ts';

/** FWHM ∝ X^SEEING_AIRMASS_EXPONENT (Roddier 1981, from memory). */
export const SEEING_AIRMASS_EXPONENT = 0.6;

export interface PrecisionModel {
  /** 1σ of each astrometric offset at the zenith in the reference seeing, mas, > 0. Default 1. */
  astrometryMas: number;
  /** 1σ of a radial velocity at the zenith in the reference seeing, km/s, > 0. Default 5. */
  spectroscopyKmS: number;
  /**
   * Seeing FWHM the zenith values hold for, arcsec, (0, 10]; null: the site's own seeing (the ratio
   * is 1 at the zenith).
   */
  referenceSeeingArcsec: number | null;
}

/** Where neither the campaign nor the site gives a field (the values are the kinds' descriptor's). */
export const DEFAULT_PRECISION: PrecisionModel = {
  astrometryMas: DEFAULT_ZENITH_SIGMA.astrometry.value,
  spectroscopyKmS: DEFAULT_ZENITH_SIGMA.spectroscopy.value,
  referenceSeeingArcsec: null,
};

/** A model from partial settings: each field from the first layer that gives it (campaign, then site, then default). */
export function precisionModel(
  layers: readonly (Partial<PrecisionModel> | null | undefined)[],
  field = 'precision',
): PrecisionModel {
  const pick = <K extends keyof PrecisionModel>(k: K): PrecisionModel[K] => {
    for (const l of layers) if (l && l[k] !== undefined) return l[k] as PrecisionModel[K];
    return DEFAULT_PRECISION[k];
  };
  const ref = pick('referenceSeeingArcsec');
  return {
    astrometryMas: positive(`${field}.astrometryMas`, pick('astrometryMas'), 1e6),
    spectroscopyKmS: positive(`${field}.spectroscopyKmS`, pick('spectroscopyKmS'), 1e6),
    referenceSeeingArcsec:
      ref === null ? null : positive(`${field}.referenceSeeingArcsec`, ref, 10),
  };
}

/**
 * The expected 1σ at an airmass.
 * @param airmass ≥ 1 (values below 1 are read as 1)
 * @param zenithSeeingArcsec the site's zenith seeing, arcsec, or null when unknown (the reference then)
 */
export function precisionAt(
  model: PrecisionModel,
  airmass: number,
  zenithSeeingArcsec: number | null,
): Precision & { seeingArcsec: number | null } {
  if (!Number.isFinite(airmass)) throw new InputError('airmass', airmass, 'must be finite');
  const x = Math.max(1, airmass) ** SEEING_AIRMASS_EXPONENT;
  const site = zenithSeeingArcsec ?? model.referenceSeeingArcsec;
  const ratio = (site ?? 1) / (model.referenceSeeingArcsec ?? site ?? 1);
  return {
    astrometryMas: model.astrometryMas * ratio * x,
    spectroscopyKmS: model.spectroscopyKmS * ratio * x,
    seeingArcsec: site === null ? null : site * x,
  };
}
