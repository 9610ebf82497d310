/** The cautions every plan carries. The site's own rules always take precedence over this tool. */

/** Shown with every block that uses a laser guide star. */
export const LASER_GUIDE_STAR_CAUTION =
  'Laser guide star: aircraft and satellite avoidance follow the site’s laser-traffic rules and ' +
  'the local aviation authority, not this tool; stop propagating whenever they say so.';

/** Shown with every plan. */
export const PLAN_ADVISORY =
  'This plan is advisory: blocks start and end inside darkness and outside the Sun-avoidance ' +
  'angle as computed here, but the site’s pointing limits, Sun-avoidance interlocks and ' +
  'operating rules take precedence.';
