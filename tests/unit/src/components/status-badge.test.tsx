// @vitest-environment happy-dom
import { afterEach, expect, test } from 'vitest';
import { cleanup, render } from '@testing-library/react';
import { StatusBadge, STATUSES } from '../../../../src/components/ui/status-badge';

afterEach(cleanup);

// WCAG 2.2 SC 1.4.1 Use of Color: every state carries a word and an icon as well as a colour.
test.each(STATUSES)('the %s badge shows a word and an icon, not colour alone', (status) => {
  const { container } = render(<StatusBadge status={status} />);
  const badge = container.firstElementChild!;
  expect(badge.textContent!.trim().length).toBeGreaterThan(3);
  expect(badge.querySelector('svg')).not.toBeNull();
});

test('a badge can say more than its state word', () => {
  const { getByText } = render(<StatusBadge status="over-limit" label="Over limit by 12 min" />);
  expect(getByText('Over limit by 12 min')).toBeTruthy();
});
