import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { TemplateForm } from '@/features/settings/components/template-form';

/** The owner's export-template form: placeholders listed, unknown ones reported while typing. */

// userEvent.type treats `{` and `[` as key descriptors; `{{` types one literal `{`.
const typed = (text: string) => text.replace(/[{[]/g, (c) => c + c);

describe('export template form', () => {
  afterEach(cleanup);

  it('lists every placeholder with what it expands to', () => {
    render(<TemplateForm onSubmit={() => {}} />);
    const list = screen.getByRole('group', { name: 'Placeholders' });
    for (const name of ['{{geometry}}', '{{geometryBohr}}', '{{uniqueGeometry}}', '{{charge}}', '{{multiplicity}}', '{{group}}', '{{subgroup}}']) {
      expect(list.textContent).toContain(name);
    }
  });

  it('reports unknown and unclosed placeholders inline as they are typed, and does not submit them', async () => {
    const onSubmit = vi.fn();
    const user = userEvent.setup();
    render(<TemplateForm onSubmit={onSubmit} />);
    await user.type(screen.getByLabelText('Name'), 'Frequency job');
    const deck = screen.getByLabelText('Deck');
    await user.type(deck, typed('charge {{chrage}} {{multiplicity}}'));
    expect(screen.getByRole('alert').textContent).toBe('Unknown placeholder {{chrage}}');
    expect(deck.getAttribute('aria-invalid')).toBe('true');

    await user.type(deck, typed('\n{{geometry}'));
    expect(screen.getByRole('alert').textContent).toBe('Unknown placeholders {{chrage}}, {{geometry} (not closed)');

    await user.click(screen.getByRole('button', { name: 'Add template' }));
    expect(onSubmit).not.toHaveBeenCalled();

    await user.clear(deck);
    await user.type(deck, typed('charge {{charge}} {{multiplicity}}\n{{geometry}}'));
    expect(screen.queryByRole('alert')).toBeNull();
    await user.click(screen.getByRole('button', { name: 'Add template' }));
    expect(onSubmit).toHaveBeenCalledWith({ name: 'Frequency job', fileExtension: 'inp', body: 'charge {{charge}} {{multiplicity}}\n{{geometry}}' });
  });

  it('asks for a name, a deck and a plain file extension before submitting', async () => {
    const onSubmit = vi.fn();
    const user = userEvent.setup();
    render(<TemplateForm onSubmit={onSubmit} />);
    const ext = screen.getByLabelText('File extension');
    await user.clear(ext);
    await user.type(ext, '../inp');
    await user.click(screen.getByRole('button', { name: 'Add template' }));
    expect(onSubmit).not.toHaveBeenCalled();
    expect(screen.getAllByText('Required', { selector: 'p' })).toHaveLength(2); // name and deck
    expect(screen.getByText(/^Letters, digits, _ and -/)).toBeTruthy();
    expect(screen.getByLabelText('Name').getAttribute('aria-invalid')).toBe('true');
    expect(screen.getByLabelText('File extension').getAttribute('aria-invalid')).toBe('true');
  });

  it('starts from the template being edited', () => {
    render(<TemplateForm initial={{ name: 'Single point', fileExtension: 'in', body: '{{geometry}}' }} onSubmit={() => {}} />);
    expect((screen.getByLabelText('Name') as HTMLInputElement).value).toBe('Single point');
    expect((screen.getByLabelText('Deck') as HTMLTextAreaElement).value).toBe('{{geometry}}');
    expect(screen.getByRole('button', { name: 'Save template' })).toBeTruthy();
  });
});
