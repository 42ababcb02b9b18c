// @vitest-environment happy-dom
import { cleanup, render, screen } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { diffSites } from '../../../../../shared/index.ts';
import { checked, REVERSED_SITE, SOUND_SITE } from '../../../test/site-fixtures.ts';
import { DiffTable, flattenChanges } from './diff-table.tsx';

afterEach(cleanup);

describe('DiffTable', () => {
  it('when one field changed against the approved revision, then that field shows with before and after', () => {
    const changes = diffSites(checked(SOUND_SITE).site, checked(REVERSED_SITE).site);
    render(<DiffTable changes={changes} against="approved revision 1" />);
    expect(screen.getByText('1 field differs from approved revision 1')).toBeTruthy();
    const row = screen.getByRole('row', { name: /cts\[ct-3\]\.arrow/ });
    expect(row.getAttribute('data-change')).toBe('changed');
    expect(row.querySelector('del')?.textContent).toBe('toward-load');
    expect(row.querySelector('ins')?.textContent).toBe('toward-grid');
  });

  it('when there is no earlier approval, then whole sections are listed field by field', () => {
    const changes = diffSites(null, checked(SOUND_SITE).site);
    const flat = flattenChanges(changes);
    expect(flat.every((c) => c.kind === 'added')).toBe(true);
    expect(flat).toContainEqual({ path: 'meter.currentInputs.I2.conductor', kind: 'added', before: null, after: 'L2' });
    expect(flat).toContainEqual({ path: 'generation[roof-south].units', kind: 'added', before: null, after: 8 });
    expect(flat).toContainEqual({ path: 'gateway.bus.terminations', kind: 'added', before: null, after: ['gateway', 'meter'] });
  });
});
