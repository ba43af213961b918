import { FINDING_CATEGORIES, FINDING_CATEGORY_LABELS, FINDING_CATEGORY_MEANINGS, type FindingCategory } from '@wingstage/shared';
import { fireEvent, render, screen } from '@testing-library/react';
import { useForm, useWatch } from 'react-hook-form';
import { describe, expect, it } from 'vitest';
import { CategoryBadge } from '@/components/ui/finding-badges';
import { CategoryChoice } from './category-choice';

function Harness() {
  const { register, control } = useForm<{ category?: FindingCategory }>();
  const current = useWatch({ control, name: 'category' }) ?? null;
  return <CategoryChoice current={current} {...register('category')} />;
}

describe('CategoryChoice', () => {
  it('offers each category as a radio named by its word, with an icon and its meaning', () => {
    render(<Harness />);
    expect(screen.getByRole('group', { name: /Category/ })).toBeTruthy();
    for (const c of FINDING_CATEGORIES) {
      const radio = screen.getByRole('radio', { name: new RegExp(`^${FINDING_CATEGORY_LABELS[c]}`) });
      const label = radio.closest('label')!;
      expect(label.textContent).toContain(FINDING_CATEGORY_LABELS[c]);
      expect(label.textContent).toContain(FINDING_CATEGORY_MEANINGS[c]);
      expect(label.querySelectorAll('svg')).toHaveLength(1);
    }
  });

  it('marks the chosen category with a tick and a heavier border, not by colour alone', () => {
    render(<Harness />);
    fireEvent.click(screen.getByRole('radio', { name: /^Advisory/ }));
    const chosen = screen.getByRole('radio', { name: /^Advisory/ }).closest('label')!;
    const other = screen.getByRole('radio', { name: /^Recommended/ }).closest('label')!;
    expect((screen.getByRole('radio', { name: /^Advisory/ }) as HTMLInputElement).checked).toBe(true);
    expect(chosen.textContent).toContain('✓');
    expect(other.textContent).not.toContain('✓');
    expect(chosen.className).toContain('border-[3px]');
    expect(other.className).not.toContain('border-[3px]');
  });

  it('gives the three categories three different icons, and the badge its word as well as its icon', () => {
    render(<Harness />);
    const paths = FINDING_CATEGORIES.map((c) => screen.getByRole('radio', { name: new RegExp(`^${FINDING_CATEGORY_LABELS[c]}`) }).closest('label')!.querySelector('svg')!.innerHTML);
    expect(new Set(paths).size).toBe(3);
    const { container } = render(<CategoryBadge category="airworthiness" />);
    const badge = container.querySelector('[data-category="airworthiness"]')!;
    expect(badge.textContent).toBe('Airworthiness');
    expect(badge.querySelector('svg')).toBeTruthy();
  });
});
