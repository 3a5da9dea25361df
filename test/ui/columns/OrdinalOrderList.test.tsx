// @vitest-environment jsdom
import { act, cleanup, render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Decision } from '../../../src/core/decisions.ts';
import { OrdinalOrderList } from '../../../src/ui/columns/OrdinalOrderList.tsx';
import { insulationColumn } from '../fixtures.ts';

/**
 * jsdom lays nothing out, so every box measures 0 × 0 and the keyboard sensor would find no
 * neighbour to move to. Give each level row the box it would have in a 40 px-per-row list,
 * derived from its place among its siblings (the DOM order does not change while dragging).
 */
const realRect = HTMLElement.prototype.getBoundingClientRect;
beforeAll(() => {
  HTMLElement.prototype.getBoundingClientRect = function (this: HTMLElement): DOMRect {
    if (this.matches('li.lw-order__item')) {
      const index = [...(this.parentElement?.children ?? [])].indexOf(this);
      const top = index * 40;
      return { x: 0, y: top, top, left: 0, right: 300, bottom: top + 36, width: 300, height: 36, toJSON: () => ({}) };
    }
    return realRect.call(this);
  };
});
afterAll(() => {
  HTMLElement.prototype.getBoundingClientRect = realRect;
});
afterEach(cleanup);

function renderOrder() {
  const onDecide = vi.fn<(d: Decision) => void>();
  render(<OrdinalOrderList column="insulation" levels={insulationColumn.levels} codes={['1', '2', '3', '4']} onDecide={onDecide} />);
  return onDecide;
}

/** The sensor starts listening for arrow keys on the next tick after the lift. */
const nextTick = () => act(() => new Promise<void>((resolve) => setTimeout(resolve, 0)));

describe('OrdinalOrderList', () => {
  it('lists the levels in their order with counts and codes', () => {
    renderOrder();
    const items = screen.getAllByRole('listitem');
    expect(items.map((li) => li.dataset['level'])).toEqual(['poor', 'fair', 'good', 'very good']);
    expect(items[1]?.textContent).toContain('402 rows');
    expect(items[1]?.textContent).toContain('→ 2');
    expect(screen.getByRole('button', { name: 'Move “fair”, place 2 of 4' })).toBeTruthy();
  });

  it('moves a level two places down with the keyboard alone and emits the new order', async () => {
    const user = userEvent.setup();
    const onDecide = renderOrder();
    const handle = screen.getByRole('button', { name: 'Move “poor”, place 1 of 4' });
    handle.focus();
    await user.keyboard('[Space]');
    await nextTick();
    await user.keyboard('[ArrowDown]');
    await user.keyboard('[ArrowDown]');
    await user.keyboard('[Space]');
    const live = [...document.querySelectorAll('[aria-live]')].map((n) => n.textContent).join(' | ');
    expect(live).toContain('“poor” put down at place 3 of 4.');
    expect(onDecide).toHaveBeenCalledTimes(1);
    expect(onDecide).toHaveBeenCalledWith({ type: 'set-order', column: 'insulation', order: ['fair', 'good', 'poor', 'very good'] });
  });

  it('moves a level up with the keyboard', async () => {
    const user = userEvent.setup();
    const onDecide = renderOrder();
    screen.getByRole('button', { name: 'Move “very good”, place 4 of 4' }).focus();
    await user.keyboard('[Space]');
    await nextTick();
    await user.keyboard('[ArrowUp]');
    await user.keyboard('[Space]');
    expect(onDecide).toHaveBeenCalledWith({ type: 'set-order', column: 'insulation', order: ['poor', 'fair', 'very good', 'good'] });
  });

  it('announces each step in its own words and emits nothing when the move is cancelled', async () => {
    const user = userEvent.setup();
    const onDecide = renderOrder();
    // The instructions the handles point to.
    const instructionsId = screen.getByRole('button', { name: 'Move “poor”, place 1 of 4' }).getAttribute('aria-describedby');
    expect(document.getElementById(instructionsId ?? '')?.textContent).toMatch(/^To move this level, press Space\./);

    screen.getByRole('button', { name: 'Move “poor”, place 1 of 4' }).focus();
    await user.keyboard('[Space]');
    await nextTick();
    const live = () => [...document.querySelectorAll('[aria-live]')].map((n) => n.textContent).join(' | ');
    expect(live()).toContain('Lifted “poor”, place 1 of 4.');
    await user.keyboard('[ArrowDown]');
    expect(live()).toContain('“poor” is over place 2 of 4.');
    await user.keyboard('[Escape]');
    expect(live()).toContain('Move cancelled. “poor” stays at place 1 of 4.');
    expect(onDecide).not.toHaveBeenCalled();
  });

  it('reverses the order with one button', async () => {
    const user = userEvent.setup();
    const onDecide = renderOrder();
    await user.click(screen.getByRole('button', { name: 'Reverse the order' }));
    expect(onDecide).toHaveBeenCalledWith({ type: 'reverse-order', column: 'insulation' });
  });
});
