import { JOB_STATES, JOB_STATE_LABELS } from '@wingstage/shared';
import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { StateBadge } from './state-badge';

describe('StateBadge', () => {
  it.each(JOB_STATES)('shows %s with its text label and an icon hidden from screen readers', (state) => {
    const { container } = render(<StateBadge state={state} />);
    const badge = screen.getByText(JOB_STATE_LABELS[state]);
    expect(badge.getAttribute('data-state')).toBe(state);
    const svg = container.querySelector('svg');
    expect(svg).not.toBeNull();
    expect(svg!.getAttribute('aria-hidden')).toBe('true');
  });

  it('gives every state its own icon, so the states differ without colour', () => {
    const shapes = JOB_STATES.map((s) => render(<StateBadge state={s} />).container.querySelector('svg')!.innerHTML);
    expect(new Set(shapes).size).toBe(JOB_STATES.length);
  });
});
