// @vitest-environment happy-dom
import { cleanup, render, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { checked, MISSING_CT_SITE, REVERSED_SITE, SOUND_SITE, WRONG_PHASE_SITE } from '../../../test/site-fixtures.ts';
import { DiagramFaultList, SiteDiagram } from './site-diagram.tsx';

afterEach(cleanup);

function ctMark(container: HTMLElement, ctId: string): Element {
  const el = container.querySelector(`[data-ct="${ctId}"]`);
  if (!el) throw new Error(`no CT ${ctId} drawn`);
  return el;
}

describe('SiteDiagram', () => {
  it('when a CT is on the wrong phase, then that CT, and only that one, is marked wrong-phase', () => {
    const { site, findings } = checked(WRONG_PHASE_SITE);
    // The engine itself reports the fault at the terminal's conductor (rules.md, meter-ct-phase-pair).
    expect(findings.map((f) => [f.ruleId, f.path])).toContainEqual(['meter-ct-phase-pair', 'meter.currentInputs.I2.conductor']);
    const { container } = render(<SiteDiagram site={site} findings={findings} title="Orchard Row Dairy" />);

    const wrong = ctMark(container, 'ct-2');
    expect(wrong.getAttribute('data-fault')).toContain('wrong-phase');
    expect(wrong.getAttribute('aria-label')).toMatch(/CT ct-2 on L3, current input I2.*wrong phase/);
    expect(wrong.querySelector('title')?.textContent).toContain('meter-ct-phase-pair');
    expect(ctMark(container, 'ct-1').getAttribute('data-fault')).toBeNull();
    expect(ctMark(container, 'ct-3').getAttribute('data-fault')).toBeNull();

    // Drawn on the conductor it is clamped on, with the mismatch in words beside it.
    expect(container.querySelector('[data-fault-label="wrong-phase"]')?.textContent).toBe('✕ I2 on L3, V2 on L2');
    expect(screen.getByRole('group', { name: /Single-line diagram of Orchard Row Dairy\. Marked faults: ct-2 on I2: wrong phase/ })).toBeTruthy();
    expect(screen.getByRole('img', { name: /CT ct-2 on L3.*wrong phase/ })).toBeTruthy();
  });

  it('when a CT faces the grid, then it is marked reversed and its arrow points to the grid', () => {
    const { site, findings } = checked(REVERSED_SITE);
    expect(findings.map((f) => [f.ruleId, f.path])).toContainEqual(['ct-arrow-toward-grid', 'cts[2].arrow']);
    const { container } = render(<SiteDiagram site={site} findings={findings} />);
    const reversed = ctMark(container, 'ct-3');
    expect(reversed.getAttribute('data-fault')).toBe('reversed');
    // Grid on the left: a reversed arrow's tip is on the left of the ring's centre (x = 380).
    const tip = reversed.querySelector('path')?.getAttribute('d') ?? '';
    expect(tip).toMatch(/^M387 \d+L373 /);
    expect(ctMark(container, 'ct-1').getAttribute('data-fault')).toBeNull();
  });

  it('when a reading shows export where import was expected, then the CT on that conductor is marked reversed', () => {
    const text = `${SOUND_SITE}commissioning:
  readings:
    - label: loads-on-generation-off
      expect: import
      L1: { v: 231, a: 10, kw: 2.2 }
      L2: { v: 230, a: 9, kw: -1.95 }
      L3: { v: 229, a: 8, kw: 1.7 }
`;
    const { site, findings } = checked(text);
    // |PF| = 1.95·1000/(230·9) = 0.94 ≥ 0.8 with kw < 0 under expect: import (rules.md, reading-ct-reversed).
    expect(findings.map((f) => f.ruleId)).toContain('reading-ct-reversed');
    const { container } = render(<SiteDiagram site={site} findings={findings} />);
    expect(ctMark(container, 'ct-2').getAttribute('data-fault')).toBe('reversed');
    expect(ctMark(container, 'ct-1').getAttribute('data-fault')).toBeNull();
  });

  it('when a live conductor has no CT, then a dashed "no CT" symbol is drawn on that conductor', () => {
    const { site, findings } = checked(MISSING_CT_SITE);
    expect(findings.map((f) => f.ruleId)).toContain('meter-ct-missing');
    const { container } = render(<SiteDiagram site={site} findings={findings} />);
    const missing = container.querySelectorAll('[data-fault="missing"]');
    expect(missing).toHaveLength(1);
    expect(missing[0].getAttribute('data-conductor')).toBe('L3');
    expect(within(missing[0] as HTMLElement).getByText('no CT')).toBeTruthy();
  });

  it('when the site is sound, then nothing is marked and every CT, meter and group is drawn', () => {
    const { site, findings } = checked(SOUND_SITE);
    const { container } = render(<SiteDiagram site={site} findings={findings} />);
    expect(container.querySelectorAll('[data-fault]')).toHaveLength(0);
    expect(container.querySelectorAll('[data-ct]')).toHaveLength(3);
    expect(container.querySelectorAll('[data-generation]')).toHaveLength(3);
    expect(container.querySelectorAll('[data-conductor]')).toHaveLength(4); // L1, L2, L3, N
    render(<DiagramFaultList site={site} findings={findings} />);
    expect(screen.getByText('No wiring faults marked on the diagram.')).toBeTruthy();
  });

  it('lists the marks in words as well as drawing them', () => {
    const { site, findings } = checked(WRONG_PHASE_SITE);
    render(<DiagramFaultList site={site} findings={findings} />);
    expect(screen.getByText('CT ct-2 on current input I2 is clamped on L3, but V2 is wired to L2: wrong phase.')).toBeTruthy();
  });

  it('renders markup in names as text', () => {
    const { site, findings } = checked(SOUND_SITE.replace('roof-east', '"<img src=x onerror=alert(1)>"'));
    const { container } = render(<SiteDiagram site={site} findings={findings} />);
    expect(container.querySelector('img')).toBeNull();
    expect(container.innerHTML).toContain('&lt;img');
  });
});
