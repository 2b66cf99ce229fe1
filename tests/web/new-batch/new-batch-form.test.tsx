import { cleanup, render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { snapSettingsSchema } from '@shared/contracts/settings';
import { NewBatchForm } from '@/features/new-batch/components/new-batch-form';

afterEach(cleanup);

// The schema's own defaults stand in for a workspace's defaults.
const defaults = snapSettingsSchema.parse({});

function setup() {
  const onSubmit = vi.fn();
  const user = userEvent.setup();
  render(<NewBatchForm defaults={defaults} onSubmit={onSubmit} />);
  return { onSubmit, user };
}

const xyz = () => new File(['3\nwater (UI fixture)\nO 0 0 0.117\nH 0 0.757 -0.467\nH 0 -0.757 -0.467\n'], 'water.xyz', { type: 'chemical/x-xyz' });

async function replace(user: ReturnType<typeof userEvent.setup>, label: RegExp | string, value: string) {
  const input = screen.getByLabelText(label);
  await user.clear(input);
  if (value) await user.type(input, value);
}

describe('new-batch form', () => {
  it('starts from the workspace defaults', () => {
    setup();
    expect((screen.getByLabelText('Tolerance') as HTMLInputElement).value).toBe('0.01');
    expect((screen.getByLabelText('Displacement budget') as HTMLInputElement).value).toBe('0.05');
    expect((screen.getByLabelText('Default charge') as HTMLInputElement).value).toBe('0');
    expect((screen.getByLabelText(/^The perceived group/) as HTMLInputElement).checked).toBe(true);
    expect((screen.getByLabelText(/^Standard frame/) as HTMLInputElement).checked).toBe(true);
    expect((screen.getByLabelText('XYZ') as HTMLInputElement).checked).toBe(true);
    expect((screen.getByLabelText('QCSchema JSON') as HTMLInputElement).checked).toBe(true);
    expect((screen.getByLabelText('MDL molfile') as HTMLInputElement).checked).toBe(false);
  });

  it('asks for files when none were added, and does not submit', async () => {
    const { onSubmit, user } = setup();
    await user.click(screen.getByRole('button', { name: 'Upload and snap' }));
    expect(await screen.findByText('Add at least one file or ZIP.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('rejects a tolerance out of range and a fractional charge with inline messages tied to the fields', async () => {
    const { onSubmit, user } = setup();
    await user.upload(screen.getByLabelText('Geometry files or ZIPs'), xyz());
    await replace(user, 'Tolerance', '2');
    await replace(user, 'Default charge', '1.5');
    await user.click(screen.getByRole('button', { name: 'Upload and snap' }));

    const tolerance = screen.getByLabelText('Tolerance');
    await waitFor(() => expect(tolerance.getAttribute('aria-invalid')).toBe('true'));
    const toleranceError = document.getElementById(tolerance.getAttribute('aria-describedby')!.split(' ').pop()!);
    expect(toleranceError?.textContent).toBe('Tolerance must be a number above 0 and at most 1 Å.');
    expect(screen.getByText('Charge must be a whole number from −20 to 20.')).toBeTruthy();
    expect(screen.queryByText('Add at least one file or ZIP.')).toBeNull();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('rejects an empty tolerance, a zero budget, a multiplicity of 0, a typo in the named group and no output format', async () => {
    const { onSubmit, user } = setup();
    await user.upload(screen.getByLabelText('Geometry files or ZIPs'), xyz());
    await replace(user, 'Tolerance', '');
    await replace(user, 'Displacement budget', '0');
    await replace(user, 'Default multiplicity', '0');
    await user.click(screen.getByLabelText(/^A named group/));
    await replace(user, 'Group (Schoenflies)', 'C2x');
    await user.click(screen.getByLabelText('XYZ'));
    await user.click(screen.getByLabelText('QCSchema JSON'));
    await user.click(screen.getByRole('button', { name: 'Upload and snap' }));

    expect(await screen.findByText('Tolerance must be a number above 0 and at most 1 Å.')).toBeTruthy();
    expect(screen.getByText('Displacement budget must be a number above 0 and at most 5 Å.')).toBeTruthy();
    expect(screen.getByText(/^Multiplicity must be a whole number from 1 to 20/)).toBeTruthy();
    expect(screen.getByText('Name the target group in Schoenflies notation, e.g. C2v, D3h or Td.')).toBeTruthy();
    expect(screen.getByText('Choose at least one output format.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('submits the files, a name from the files, and the settings parsed by the shared schema', async () => {
    const { onSubmit, user } = setup();
    const file = xyz();
    await user.upload(screen.getByLabelText('Geometry files or ZIPs'), file);
    expect(screen.getByRole('list', { name: 'Files to upload' }).textContent).toContain('water.xyz');
    await replace(user, 'Tolerance', '0.02');
    await replace(user, 'Default charge', '-1');
    await replace(user, 'Default multiplicity', '2');
    await user.click(screen.getByLabelText(/^A named group/));
    await replace(user, 'Group (Schoenflies)', 'c2v');
    await user.click(screen.getByLabelText(/^Keep the input frame/));
    await user.click(screen.getByLabelText('Extended XYZ'));
    await user.click(screen.getByRole('button', { name: 'Upload and snap' }));

    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    const values = onSubmit.mock.calls[0][0];
    expect(values.name).toBe('water');
    expect(values.files).toEqual([file]);
    expect(values.settings).toEqual({
      tolerance: 0.02,
      target: { kind: 'group', group: 'C2v' },
      frame: 'input',
      displacementBudget: 0.05,
      charge: -1,
      multiplicity: 2,
      outputFormats: ['xyz', 'extxyz', 'qcschema'],
    });
    // What was submitted is exactly what the API's schema accepts.
    expect(snapSettingsSchema.parse(values.settings)).toEqual(values.settings);
  });

  it('drops the named-group text when another target is chosen, and leaves multiplicity to the electron count when empty', async () => {
    const { onSubmit, user } = setup();
    await user.upload(screen.getByLabelText('Geometry files or ZIPs'), xyz());
    await user.click(screen.getByLabelText(/^A named group/));
    await replace(user, 'Group (Schoenflies)', 'D3h');
    await user.click(screen.getByLabelText(/^The computational subgroup/));
    await user.type(screen.getByLabelText('Batch name'), 'Water check');
    await user.click(screen.getByRole('button', { name: 'Upload and snap' }));

    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    const values = onSubmit.mock.calls[0][0];
    expect(values.name).toBe('Water check');
    expect(values.settings.target).toEqual({ kind: 'computational' });
    expect(values.settings.multiplicity).toBeNull();
  });

  it('lets a file be removed again', async () => {
    const { user } = setup();
    await user.upload(screen.getByLabelText('Geometry files or ZIPs'), xyz());
    await user.click(screen.getByRole('button', { name: 'Remove water.xyz' }));
    expect(screen.queryByRole('list', { name: 'Files to upload' })).toBeNull();
  });
});
