import { describe, expect, it } from 'vitest';
import { GHS_PICTOGRAMS } from '../../shared/constants';
import { HAZARD_STATEMENT_RE } from '../../shared/schemas/materials';
import { GHS_PICTOGRAM_INFO, HAZARD_STATEMENT_TEXT, hazardStatementText, pictogramInfo } from '../../src/components/common/ghs';

describe('GHS texts shown beside the hazard codes', () => {
  it('names the nine pictograms as UN GHS does', () => {
    // UN GHS Annex 3 / handbook references: GHS01 exploding bomb … GHS09 environment.
    expect(GHS_PICTOGRAM_INFO.map((p) => p.code)).toEqual([...GHS_PICTOGRAMS]);
    expect(pictogramInfo('GHS01').name).toBe('Exploding bomb');
    expect(pictogramInfo('GHS03').name).toBe('Flame over circle');
    expect(pictogramInfo('GHS06').name).toBe('Skull and crossbones');
    expect(pictogramInfo('GHS07').name).toBe('Exclamation mark');
    expect(pictogramInfo('GHS09').name).toBe('Environment');
  });

  it('gives the statement texts common on adhesives word for word', () => {
    // UN GHS Annex 3, Table A3.1.2, as quoted in the handbook's references.
    expect(hazardStatementText('H315')).toBe('Causes skin irritation.');
    expect(hazardStatementText('H317')).toBe('May cause an allergic skin reaction.');
    expect(hazardStatementText('H318')).toBe('Causes serious eye damage.');
    expect(hazardStatementText('H319')).toBe('Causes serious eye irritation.');
    expect(hazardStatementText('H335')).toBe('May cause respiratory irritation.');
    // EU CLP Annex II supplement for cyanoacrylates.
    expect(hazardStatementText('EUH202')).toBe('Cyanoacrylate. Danger. Bonds skin and eyes in seconds. Keep out of the reach of children.');
  });

  it('joins combined statements and refers unknown codes to the SDS (null)', () => {
    // UN GHS A3.1.3: combined statements such as H301 + H311.
    expect(hazardStatementText('H301+H311')).toBe('Toxic if swallowed. Toxic in contact with skin.');
    expect(hazardStatementText('H360Fd')).toBe('May damage fertility or the unborn child.');
    expect(hazardStatementText('H399')).toBeNull();
    expect(hazardStatementText('H317+H399')).toBeNull();
  });

  it('only lists codes the material schema accepts', () => {
    for (const code of Object.keys(HAZARD_STATEMENT_TEXT)) expect(code).toMatch(HAZARD_STATEMENT_RE);
  });
});
