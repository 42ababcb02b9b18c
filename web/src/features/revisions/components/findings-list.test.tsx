// @vitest-environment happy-dom
import { cleanup, render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Finding } from '../../../../../shared/index.ts';
import { checked, REVERSED_SITE, SOUND_SITE, WRONG_PHASE_SITE } from '../../../test/site-fixtures.ts';
import { FindingsList } from './findings-list.tsx';
import { YamlView } from './yaml-view.tsx';

afterEach(cleanup);

// One error, one warning and the info findings the engine gives a site with no commissioning.
const faulty = checked(WRONG_PHASE_SITE.replace('arrow: toward-load }\ngateway', 'arrow: toward-grid }\ngateway'));

describe('FindingsList', () => {
  it('when findings of each severity exist, then they are grouped under Errors, Warnings and Infos with counts', () => {
    render(<FindingsList findings={faulty.findings} />);
    const counts = { error: 0, warning: 0, info: 0 };
    for (const f of faulty.findings) counts[f.severity]++;
    expect(counts.error).toBeGreaterThan(0);
    expect(counts.warning).toBeGreaterThan(0);
    const headings = screen.getAllByRole('heading', { level: 3 }).map((h) => h.textContent);
    expect(headings[0]).toBe(`Errors (${counts.error})`);
    expect(headings[1]).toBe(`Warnings (${counts.warning})`);
    if (counts.info) expect(headings[2]).toBe(`Infos (${counts.info})`);
    const errors = within(screen.getByRole('region', { name: /Errors/ }));
    expect(errors.getByText('meter-ct-phase-pair')).toBeTruthy();
    expect(within(screen.getByRole('region', { name: /Warnings/ })).getByText('ct-arrow-toward-grid')).toBeTruthy();
  });

  it('shows each finding’s rule, message, hint and source, and links it to its line', async () => {
    const onSelectLine = vi.fn();
    render(<FindingsList findings={faulty.findings} onSelectLine={onSelectLine} />);
    const pair = faulty.findings.find((f) => f.ruleId === 'meter-ct-phase-pair')!;
    expect(screen.getByText(pair.message)).toBeTruthy();
    expect(screen.getByText(pair.hint!)).toBeTruthy();
    expect(screen.getByText(`Source: ${pair.source}`)).toBeTruthy();
    // The engine puts it on the line of `I2: { ct: ct-2, conductor: L3 }` (line 24 of the fixture).
    expect(pair.line).toBe(WRONG_PHASE_SITE.split('\n').findIndex((l) => l.includes('I2: { ct: ct-2')) + 1);
    const link = screen.getByRole('link', { name: new RegExp(`^Line ${pair.line}, column ${pair.column}, at meter\\.currentInputs\\.I2\\.conductor`) });
    expect(link.getAttribute('href')).toBe(`#yaml-line-${pair.line}`);
    await userEvent.click(link);
    expect(onSelectLine).toHaveBeenCalledWith(pair.line);
  });

  it('when there are no findings, then it says every rule passed', () => {
    render(<FindingsList findings={[]} />);
    expect(screen.getByText('No findings: every rule passed.')).toBeTruthy();
  });

  it('renders markup in messages as inert text', () => {
    const evil: Finding = { ruleId: 'schema', severity: 'error', message: '<img src=x onerror="alert(1)">', path: '', line: 1, column: 1 };
    const { container } = render(<FindingsList findings={[evil]} />);
    expect(container.querySelector('img')).toBeNull();
    expect(screen.getByText('<img src=x onerror="alert(1)">')).toBeTruthy();
  });
});

describe('YamlView', () => {
  it('numbers every line and highlights the lines findings point at, by severity', () => {
    const { findings } = checked(REVERSED_SITE);
    const { container } = render(<YamlView text={REVERSED_SITE} findings={findings} selectedLine={null} />);
    const rows = container.querySelectorAll('tr[data-line]');
    expect(rows).toHaveLength(REVERSED_SITE.trimEnd().split('\n').length);
    const arrow = findings.find((f) => f.ruleId === 'ct-arrow-toward-grid')!;
    const row = container.querySelector(`#yaml-line-${arrow.line}`)!;
    expect(row.getAttribute('data-highlight')).toBe('warning');
    expect(row.textContent).toContain('arrow: toward-grid');
    const highlighted = [...container.querySelectorAll('tr[data-highlight]')].map((r) => Number(r.getAttribute('data-line')));
    expect(highlighted.sort((a, b) => a - b)).toEqual([...new Set(findings.map((f) => f.line))].sort((a, b) => a - b));
  });

  it('marks the selected line as the current location', () => {
    const { findings } = checked(SOUND_SITE);
    const { container } = render(<YamlView text={SOUND_SITE} findings={findings} selectedLine={3} />);
    expect(container.querySelector('[aria-current="location"]')?.getAttribute('data-line')).toBe('3');
  });
});
