/**
 * UN GHS hazard communication texts (Globally Harmonized System, Annex 1 pictograms and
 * Annex 3 hazard statements; EU CLP Annex II for the EUH supplements). The SDS of the material
 * is the authority: a code not in this list is shown with "see the SDS".
 */
export interface GhsPictogramInfo {
  code: string;
  name: string;
  /** A bundled Material icon standing in for the symbol inside the red diamond. */
  icon: string;
}

export const GHS_PICTOGRAM_INFO: readonly GhsPictogramInfo[] = [
  { code: 'GHS01', name: 'Exploding bomb', icon: 'flare' },
  { code: 'GHS02', name: 'Flame', icon: 'local_fire_department' },
  { code: 'GHS03', name: 'Flame over circle', icon: 'whatshot' },
  { code: 'GHS04', name: 'Gas cylinder', icon: 'propane_tank' },
  { code: 'GHS05', name: 'Corrosion', icon: 'science' },
  { code: 'GHS06', name: 'Skull and crossbones', icon: 'dangerous' },
  { code: 'GHS07', name: 'Exclamation mark', icon: 'priority_high' },
  { code: 'GHS08', name: 'Health hazard', icon: 'personal_injury' },
  { code: 'GHS09', name: 'Environment', icon: 'forest' },
];

/** The label templates' pictogram drawings (labels/ghs/GHSnn.svg), so screen and label match. */
const DRAWINGS = import.meta.glob('../../../labels/ghs/*.svg', { eager: true, query: '?url', import: 'default' }) as Record<string, string>;

/** URL of the pictogram's drawing, or null when there is none (the icon stands in). */
export function pictogramDrawing(code: string): string | null {
  const entry = Object.entries(DRAWINGS).find(([path]) => path.endsWith(`/${code}.svg`));
  return entry ? entry[1] : null;
}

export function pictogramInfo(code: string): GhsPictogramInfo {
  return GHS_PICTOGRAM_INFO.find((p) => p.code === code) ?? { code, name: code, icon: 'warning' };
}

export const HAZARD_STATEMENT_TEXT: Readonly<Record<string, string>> = {
  H200: 'Unstable explosive.',
  H201: 'Explosive; mass explosion hazard.',
  H202: 'Explosive; severe projection hazard.',
  H203: 'Explosive; fire, blast or projection hazard.',
  H204: 'Fire or projection hazard.',
  H205: 'May mass explode in fire.',
  H220: 'Extremely flammable gas.',
  H221: 'Flammable gas.',
  H222: 'Extremely flammable aerosol.',
  H223: 'Flammable aerosol.',
  H224: 'Extremely flammable liquid and vapour.',
  H225: 'Highly flammable liquid and vapour.',
  H226: 'Flammable liquid and vapour.',
  H227: 'Combustible liquid.',
  H228: 'Flammable solid.',
  H229: 'Pressurised container: may burst if heated.',
  H240: 'Heating may cause an explosion.',
  H241: 'Heating may cause a fire or explosion.',
  H242: 'Heating may cause a fire.',
  H250: 'Catches fire spontaneously if exposed to air.',
  H251: 'Self-heating; may catch fire.',
  H252: 'Self-heating in large quantities; may catch fire.',
  H260: 'In contact with water releases flammable gases which may ignite spontaneously.',
  H261: 'In contact with water releases flammable gas.',
  H270: 'May cause or intensify fire; oxidiser.',
  H271: 'May cause fire or explosion; strong oxidiser.',
  H272: 'May intensify fire; oxidiser.',
  H280: 'Contains gas under pressure; may explode if heated.',
  H281: 'Contains refrigerated gas; may cause cryogenic burns or injury.',
  H290: 'May be corrosive to metals.',
  H300: 'Fatal if swallowed.',
  H301: 'Toxic if swallowed.',
  H302: 'Harmful if swallowed.',
  H304: 'May be fatal if swallowed and enters airways.',
  H310: 'Fatal in contact with skin.',
  H311: 'Toxic in contact with skin.',
  H312: 'Harmful in contact with skin.',
  H314: 'Causes severe skin burns and eye damage.',
  H315: 'Causes skin irritation.',
  H317: 'May cause an allergic skin reaction.',
  H318: 'Causes serious eye damage.',
  H319: 'Causes serious eye irritation.',
  H330: 'Fatal if inhaled.',
  H331: 'Toxic if inhaled.',
  H332: 'Harmful if inhaled.',
  H334: 'May cause allergy or asthma symptoms or breathing difficulties if inhaled.',
  H335: 'May cause respiratory irritation.',
  H336: 'May cause drowsiness or dizziness.',
  H340: 'May cause genetic defects.',
  H341: 'Suspected of causing genetic defects.',
  H350: 'May cause cancer.',
  H351: 'Suspected of causing cancer.',
  H360: 'May damage fertility or the unborn child.',
  H361: 'Suspected of damaging fertility or the unborn child.',
  H362: 'May cause harm to breast-fed children.',
  H370: 'Causes damage to organs.',
  H371: 'May cause damage to organs.',
  H372: 'Causes damage to organs through prolonged or repeated exposure.',
  H373: 'May cause damage to organs through prolonged or repeated exposure.',
  H400: 'Very toxic to aquatic life.',
  H410: 'Very toxic to aquatic life with long lasting effects.',
  H411: 'Toxic to aquatic life with long lasting effects.',
  H412: 'Harmful to aquatic life with long lasting effects.',
  H413: 'May cause long lasting harmful effects to aquatic life.',
  H420: 'Harms public health and the environment by destroying ozone in the upper atmosphere.',
  EUH066: 'Repeated exposure may cause skin dryness or cracking.',
  EUH202: 'Cyanoacrylate. Danger. Bonds skin and eyes in seconds. Keep out of the reach of children.',
  EUH204: 'Contains isocyanates. May produce an allergic reaction.',
  EUH205: 'Contains epoxy constituents. May produce an allergic reaction.',
};

/**
 * The text of a statement code, combined codes joined ("H301+H311"); null when a part is not
 * in the list (show the code and refer to the SDS). Suffix letters (H360Fd) fall back to the
 * base text with the code kept beside it.
 */
export function hazardStatementText(code: string): string | null {
  const parts = code.split('+').map((part) => {
    const exact = HAZARD_STATEMENT_TEXT[part];
    if (exact) return exact;
    const base = /^(H\d{3})[A-Za-z]{1,2}$/.exec(part);
    return base ? (HAZARD_STATEMENT_TEXT[base[1]] ?? null) : null;
  });
  if (parts.some((p) => p === null)) return null;
  return parts.join(' ');
}
