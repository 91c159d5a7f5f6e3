// One dialog for the four peer-group adjustments. Each shows the statistics before and after the
// change (a preview the API computes without writing anything, refreshed whenever a choice changes),
// asks why, and applies the change only when the coordinator confirms after seeing the preview.
import type { ReactNode } from 'react';
import { useForm, type FieldValues, type UseFormReturn } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import {
  exclusionRequestSchema,
  mergeRequestSchema,
  moveRequestSchema,
  splitRequestSchema,
  type AdjustmentKind,
  type PeerGroup,
  type PeerGroupMember,
} from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Dialog, DialogActions } from '../../../components/ui/dialog.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { applyServerFieldErrors, errorMessage, formAlertMessage } from '../../../lib/form-errors.ts';
import { formatPeriod } from '../../../utils/format.ts';
import { useApplyAdjustment } from '../api/adjust-peer-groups.ts';
import { peerGroupsKeys } from '../api/peer-groups-keys.ts';
import { PreviewPanel } from './preview-panel.tsx';

/** What the page is showing: the figures a preview is computed for. */
export type AdjustmentContext = {
  controlLotId: string;
  period: string;
  level: number;
  decimals: number;
  unit: string;
};

export type AdjustmentRequest =
  | { kind: 'merge'; groups: [PeerGroup, PeerGroup] }
  | { kind: 'split'; group: PeerGroup }
  | { kind: 'move'; member: PeerGroupMember; from: PeerGroup; candidates: PeerGroup[] }
  | { kind: 'exclude'; member: PeerGroupMember };

const titles: Record<AdjustmentKind, string> = {
  merge: 'Merge two groups',
  split: 'Split a group',
  move: 'Move a procedure',
  exclude: 'Exclude a lab’s data',
};

export function AdjustmentDialog({
  request,
  context,
  onClose,
}: {
  request: AdjustmentRequest | null;
  context: AdjustmentContext;
  onClose: () => void;
}) {
  return (
    <Dialog
      open={request !== null}
      onClose={onClose}
      title={request ? titles[request.kind] : ''}
      description="Check the statistics before and after the change, say why, then confirm. Every adjustment can be undone."
      size="xl"
    >
      {request?.kind === 'merge' ? (
        <MergeForm groups={request.groups} context={context} onDone={onClose} />
      ) : null}
      {request?.kind === 'split' ? (
        <SplitForm group={request.group} context={context} onDone={onClose} />
      ) : null}
      {request?.kind === 'move' ? (
        <MoveForm
          member={request.member}
          from={request.from}
          candidates={request.candidates}
          context={context}
          onDone={onClose}
        />
      ) : null}
      {request?.kind === 'exclude' ? (
        <ExcludeForm member={request.member} context={context} onDone={onClose} />
      ) : null}
    </Dialog>
  );
}

/** Reads a form's values with its contract schema (the zod resolver's input and output types differ). */
function useContractForm<Values extends FieldValues, Schema extends z.ZodType>(
  schema: Schema,
  defaultValues: Values,
) {
  return useForm<Values, unknown, z.output<Schema>>({
    resolver: zodResolver(schema as unknown as z.ZodType<z.output<Schema>, Values>),
    defaultValues: defaultValues as never,
  });
}

/**
 * The part every adjustment shares: the live preview, the reason, and the confirm button, which
 * stays disabled until the preview for the current choices has arrived.
 */
function AdjustmentShell<Values extends FieldValues & { reason: string }, Output>({
  kind,
  form,
  previewBody,
  context,
  fields,
  confirmLabel,
  reasonLabel,
  toApplyBody,
  onDone,
}: {
  kind: AdjustmentKind;
  form: UseFormReturn<Values, unknown, Output>;
  previewBody: object;
  context: AdjustmentContext;
  fields?: ReactNode;
  confirmLabel: string;
  reasonLabel: string;
  toApplyBody: (values: Output) => object;
  onDone: () => void;
}) {
  const preview = useQuery(peerGroupsKeys.preview(kind, previewBody));
  const apply = useApplyAdjustment();
  const fieldNames = ['reason'];
  const onSubmit = form.handleSubmit((values) =>
    apply.mutate(
      { kind, body: toApplyBody(values) },
      {
        onSuccess: (adjustment) => {
          showToast(`${adjustment.description}. The figures have been recomputed.`);
          onDone();
        },
        onError: (error) => applyServerFieldErrors(error, form.setError as never, fieldNames),
      },
    ),
  );
  const reasonError = form.formState.errors.reason?.message;
  return (
    <form noValidate onSubmit={onSubmit} className="space-y-5">
      {fields ? <div className="grid gap-4 md:grid-cols-2">{fields}</div> : null}
      <div aria-live="polite">
        {preview.isPending ? (
          <p className="flex items-center gap-2 text-sm text-slate-600">
            <Spinner className="size-4" /> Computing the statistics before and after…
          </p>
        ) : preview.isError ? (
          <Alert tone="error" title="This change cannot be previewed">
            {errorMessage(preview.error)}
          </Alert>
        ) : (
          <PreviewPanel preview={preview.data} decimals={context.decimals} unit={context.unit} />
        )}
      </div>
      <TextareaField
        label={reasonLabel}
        hint="Kept in the audit log with the change."
        error={typeof reasonError === 'string' ? reasonError : undefined}
        maxLength={500}
        {...form.register('reason' as never)}
      />
      {apply.error ? (
        <Alert tone="error" title="The change was not applied">
          {formAlertMessage(apply.error, fieldNames)}
        </Alert>
      ) : null}
      <DialogActions>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
        <Button type="submit" isLoading={apply.isPending} disabled={!preview.isSuccess}>
          {confirmLabel}
        </Button>
      </DialogActions>
    </form>
  );
}

// ---------- merge ----------

const mergeFormSchema = mergeRequestSchema.pick({ targetGroupId: true, reason: true });

function MergeForm({
  groups,
  context,
  onDone,
}: {
  groups: [PeerGroup, PeerGroup];
  context: AdjustmentContext;
  onDone: () => void;
}) {
  // The larger group keeps its name by default.
  const larger = groups[1].labsWithData > groups[0].labsWithData ? groups[1] : groups[0];
  const form = useContractForm(mergeFormSchema, { targetGroupId: larger.id, reason: '' });
  const targetGroupId = form.watch('targetGroupId');
  const sourceGroupId = groups.find((g) => g.id !== targetGroupId)!.id;
  return (
    <AdjustmentShell
      kind="merge"
      form={form}
      context={context}
      previewBody={{ sourceGroupId, targetGroupId, period: context.period, level: context.level }}
      fields={
        <SelectField
          label="Group that stays"
          hint="The other group's members join it; it keeps its name."
          {...form.register('targetGroupId')}
        >
          {groups.map((g) => (
            <option key={g.id} value={g.id}>
              {g.label}
            </option>
          ))}
        </SelectField>
      }
      confirmLabel="Confirm merge"
      reasonLabel="Why do these groups belong together?"
      toApplyBody={(values) => ({
        sourceGroupId: groups.find((g) => g.id !== values.targetGroupId)!.id,
        ...values,
      })}
      onDone={onDone}
    />
  );
}

// ---------- split ----------

const splitFormSchema = splitRequestSchema.pick({ by: true, reason: true });

function SplitForm({
  group,
  context,
  onDone,
}: {
  group: PeerGroup;
  context: AdjustmentContext;
  onDone: () => void;
}) {
  const form = useContractForm(splitFormSchema, { by: 'reagent', reason: '' });
  const by = form.watch('by');
  return (
    <AdjustmentShell
      kind="split"
      form={form}
      context={context}
      previewBody={{ groupId: group.id, by, period: context.period, level: context.level }}
      fields={
        <>
          <p className="text-sm text-slate-700 md:col-span-2">
            “{group.label}” becomes one group per {by === 'reagent' ? 'reagent' : 'instrument model'} of its
            members.
          </p>
          <SelectField label="Split by" {...form.register('by')}>
            <option value="reagent">Reagent</option>
            <option value="instrumentModel">Instrument model</option>
          </SelectField>
        </>
      }
      confirmLabel="Confirm split"
      reasonLabel="Why should these members be compared separately?"
      toApplyBody={(values) => ({ groupId: group.id, ...values })}
      onDone={onDone}
    />
  );
}

// ---------- move ----------

const moveFormSchema = moveRequestSchema.pick({ targetGroupId: true, reason: true });

function MoveForm({
  member,
  from,
  candidates,
  context,
  onDone,
}: {
  member: PeerGroupMember;
  from: PeerGroup;
  candidates: PeerGroup[];
  context: AdjustmentContext;
  onDone: () => void;
}) {
  const form = useContractForm(moveFormSchema, { targetGroupId: candidates[0]?.id ?? '', reason: '' });
  const targetGroupId = form.watch('targetGroupId');
  return (
    <AdjustmentShell
      kind="move"
      form={form}
      context={context}
      previewBody={{
        procedureId: member.procedureId,
        targetGroupId,
        period: context.period,
        level: context.level,
      }}
      fields={
        <>
          <p className="text-sm text-slate-700 md:col-span-2">
            {member.lab.code} {member.procedureCode} ({member.lab.name}) leaves “{from.label}”.
          </p>
          <SelectField label="Move to" {...form.register('targetGroupId')}>
            {candidates.map((g) => (
              <option key={g.id} value={g.id}>
                {g.label}
              </option>
            ))}
          </SelectField>
        </>
      }
      confirmLabel="Confirm move"
      reasonLabel="Why does this procedure belong in the other group?"
      toApplyBody={(values) => ({ procedureId: member.procedureId, ...values })}
      onDone={onDone}
    />
  );
}

// ---------- exclude ----------

const excludeFormSchema = exclusionRequestSchema
  .pick({ reason: true })
  .extend({ scope: z.enum(['level', 'all']) });

function ExcludeForm({
  member,
  context,
  onDone,
}: {
  member: PeerGroupMember;
  context: AdjustmentContext;
  onDone: () => void;
}) {
  const form = useContractForm(excludeFormSchema, { scope: 'level', reason: '' });
  const scope = form.watch('scope');
  const target = {
    procedureId: member.procedureId,
    controlLotId: context.controlLotId,
    period: context.period,
  };
  return (
    <AdjustmentShell
      kind="exclude"
      form={form}
      context={context}
      previewBody={{ ...target, level: scope === 'level' ? context.level : null }}
      fields={
        <>
          <p className="text-sm text-slate-700 md:col-span-2">
            {member.lab.code} {member.procedureCode} ({member.lab.name}) is left out of every peer group’s
            figures for {formatPeriod(context.period)}. Its report shows that its data was excluded, with your
            reason.
          </p>
          <SelectField label="Levels" {...form.register('scope')}>
            <option value="level">Level {context.level} only</option>
            <option value="all">Every level</option>
          </SelectField>
        </>
      }
      confirmLabel="Confirm exclusion"
      reasonLabel="Why is this lab’s data left out? (the lab sees this reason)"
      toApplyBody={(values) => ({
        ...target,
        level: values.scope === 'level' ? context.level : null,
        reason: values.reason,
      })}
      onDone={onDone}
    />
  );
}
