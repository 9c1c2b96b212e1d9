/**
 * Label templates from the repository's labels/ folder: layouts (labels/layouts/*.json,
 * validated with the shared schema when first read) and GHS pictograms (labels/ghs/GHS0n.svg).
 */
import fs from 'node:fs';
import path from 'node:path';
import { GHS_PICTOGRAMS, type GhsPictogram } from '../../../shared/constants';
import { labelLayoutSchema, type LabelLayout } from '../../../shared/schemas/labels';
import { config } from '../../config';

// From the repository root (config.root), so the server also finds them when built to one file.
export const LABELS_DIR = path.join(config.root, 'labels');

let layouts: LabelLayout[] | null = null;
let pictograms: Map<GhsPictogram, string> | null = null;

/** Every layout, sorted by id. Throws (at start-up, in tests) for a template that is not valid. */
export function labelLayouts(): LabelLayout[] {
  if (!layouts) {
    const dir = path.join(LABELS_DIR, 'layouts');
    layouts = fs
      .readdirSync(dir)
      .filter((f) => f.endsWith('.json'))
      .sort()
      .map((f) => {
        const parsed = labelLayoutSchema.safeParse(JSON.parse(fs.readFileSync(path.join(dir, f), 'utf8')));
        if (!parsed.success) throw new Error(`labels/layouts/${f} is not a valid layout: ${parsed.error.message}`);
        if (`${parsed.data.id}.json` !== f) throw new Error(`labels/layouts/${f} must have the id "${f.replace(/\.json$/, '')}"`);
        return parsed.data;
      });
  }
  return layouts;
}

export function findLayout(id: string): LabelLayout | undefined {
  return labelLayouts().find((l) => l.id === id);
}

/** The inline SVG of a GHS pictogram (red diamond, black symbol). */
export function ghsSvg(code: GhsPictogram): string {
  if (!pictograms) {
    pictograms = new Map(GHS_PICTOGRAMS.map((c) => [c, fs.readFileSync(path.join(LABELS_DIR, 'ghs', `${c}.svg`), 'utf8').trim()] as const));
  }
  const svg = pictograms.get(code);
  if (!svg) throw new Error(`no pictogram ${code}`);
  return svg;
}
