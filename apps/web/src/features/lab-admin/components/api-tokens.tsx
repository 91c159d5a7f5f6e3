// The lab's API tokens, used by its middleware to send QC files: create one (the secret is shown once,
// with a copy button), see when each was last used, revoke one.
import { useId, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import {
  labApiTokenCreateSchema,
  toCsv,
  type LabApiToken,
  type LabApiTokenCreated,
} from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { CopyButton } from '../../../components/ui/copy-button.tsx';
import { Dialog, DialogActions } from '../../../components/ui/dialog.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { saveFile } from '../../../lib/api-client.ts';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../utils/format.ts';
import { labAdminKeys } from '../api/lab-admin-keys.ts';
import { useCreateToken, useRevokeToken } from '../api/lab-tokens.ts';

export function ApiTokens({ labId }: { labId: string }) {
  const headingId = useId();
  const tokens = useQuery(labAdminKeys.tokens(labId));
  const revoke = useRevokeToken();
  const [creating, setCreating] = useState(false);
  const [revoking, setRevoking] = useState<LabApiToken | null>(null);
  const list = [...(tokens.data ?? [])].sort(
    (a, b) =>
      Number(a.revokedAt !== null) - Number(b.revokedAt !== null) || b.createdAt.localeCompare(a.createdAt),
  );
  const closeRevoke = () => {
    revoke.reset();
    setRevoking(null);
  };

  return (
    <section aria-labelledby={headingId} className="space-y-3">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id={headingId} className="text-lg font-semibold text-plumb-950">
            API tokens
          </h2>
          <p className="text-sm text-slate-600">
            Your lab’s middleware sends QC files with a token instead of a person’s password. Give each system
            its own.
          </p>
        </div>
        <div className="flex gap-2">
          <Button
            variant="secondary"
            size="sm"
            disabled={list.length === 0}
            onClick={() =>
              saveFile(
                new Blob(
                  [
                    toCsv(
                      ['name', 'starts_with', 'created', 'last_used', 'revoked'],
                      list.map((t) => [t.name, t.prefix, t.createdAt, t.lastUsedAt, t.revokedAt]),
                    ),
                  ],
                  { type: 'text/csv;charset=utf-8' },
                ),
                'lab-api-tokens.csv',
              )
            }
          >
            Download CSV
          </Button>
          <Button size="sm" onClick={() => setCreating(true)}>
            Create a token
          </Button>
        </div>
      </div>
      {tokens.isError ? (
        <Alert tone="error" title="The tokens could not be loaded">
          {errorMessage(tokens.error)}
        </Alert>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white shadow-xs">
          <table className="w-full text-sm">
            <caption className="sr-only">API tokens of your lab</caption>
            <thead>
              <tr className="border-b border-slate-200 bg-slate-50 text-left text-xs text-slate-600">
                <th scope="col" className="px-3 py-2 font-semibold">
                  Name
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Starts with
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Created
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Last used
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  State
                </th>
                <th scope="col" className="px-3 py-2">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {tokens.isPending ? (
                <tr>
                  <td colSpan={6} className="px-3 py-6 text-center text-slate-600">
                    Loading…
                  </td>
                </tr>
              ) : list.length === 0 ? (
                <tr>
                  <td colSpan={6} className="px-3 py-6 text-center text-slate-600">
                    No token yet. Files are uploaded by people only.
                  </td>
                </tr>
              ) : (
                list.map((token) => (
                  <tr
                    key={token.id}
                    className={`border-b border-slate-100 ${token.revokedAt ? 'text-slate-500' : ''}`}
                  >
                    <th scope="row" className="px-3 py-2 text-left font-medium text-slate-900">
                      {token.name}
                    </th>
                    <td className="px-3 py-2 font-mono text-xs">{token.prefix}…</td>
                    <td className="px-3 py-2 text-xs whitespace-nowrap">{formatDateTime(token.createdAt)}</td>
                    <td className="px-3 py-2 text-xs whitespace-nowrap">
                      {token.lastUsedAt ? formatDateTime(token.lastUsedAt) : 'never'}
                    </td>
                    <td className="px-3 py-2">
                      {token.revokedAt ? (
                        <Badge tone="muted">Revoked {formatDateTime(token.revokedAt)}</Badge>
                      ) : (
                        <Badge tone="plumb">Active</Badge>
                      )}
                    </td>
                    <td className="px-3 py-2 text-right">
                      {token.revokedAt ? null : (
                        <Button
                          variant="ghost"
                          size="xs"
                          aria-label={`Revoke ${token.name}`}
                          onClick={() => setRevoking(token)}
                        >
                          Revoke
                        </Button>
                      )}
                    </td>
                  </tr>
                ))
              )}
            </tbody>
          </table>
        </div>
      )}
      <CreateTokenDialog labId={labId} open={creating} onClose={() => setCreating(false)} />
      <ConfirmDialog
        open={revoking !== null}
        onClose={closeRevoke}
        title={`Revoke ${revoking?.name ?? ''}?`}
        confirmLabel="Revoke token"
        tone="danger"
        isPending={revoke.isPending}
        error={revoke.error ? errorMessage(revoke.error) : null}
        onConfirm={() => {
          if (!revoking) return;
          revoke.mutate(
            { labId, tokenId: revoking.id },
            {
              onSuccess: () => {
                showToast(`Token ${revoking.name} revoked.`);
                closeRevoke();
              },
            },
          );
        }}
      >
        <p>
          Any system using this token can no longer send files. This cannot be undone; create a new token if
          it is needed again.
        </p>
      </ConfirmDialog>
    </section>
  );
}

function CreateTokenDialog({ labId, open, onClose }: { labId: string; open: boolean; onClose: () => void }) {
  const [created, setCreated] = useState<LabApiTokenCreated | null>(null);
  const close = () => {
    setCreated(null);
    onClose();
  };
  return (
    <Dialog open={open} onClose={close} title={created ? 'Copy the new token now' : 'Create an API token'}>
      {created ? (
        <TokenShownOnce token={created} onClose={close} />
      ) : (
        <CreateTokenForm labId={labId} onClose={close} onCreated={setCreated} />
      )}
    </Dialog>
  );
}

function CreateTokenForm({
  labId,
  onClose,
  onCreated,
}: {
  labId: string;
  onClose: () => void;
  onCreated: (t: LabApiTokenCreated) => void;
}) {
  const create = useCreateToken();
  const [name, setName] = useState('');
  const [error, setError] = useState<string | undefined>();
  return (
    <form
      noValidate
      onSubmit={(event) => {
        event.preventDefault();
        const parsed = labApiTokenCreateSchema.safeParse({ name });
        if (!parsed.success) {
          setError(parsed.error.issues[0]?.message);
          return;
        }
        create.mutate({ labId, body: parsed.data }, { onSuccess: onCreated });
      }}
    >
      {create.error ? (
        <div className="mb-4">
          <Alert tone="error" title="No token was created">
            {errorMessage(create.error)}
          </Alert>
        </div>
      ) : null}
      <TextField
        label="Name"
        hint="Which system will use it, e.g. “Analyser middleware, bench 2”."
        autoComplete="off"
        value={name}
        error={error}
        onChange={(event) => {
          setName(event.target.value);
          setError(undefined);
        }}
      />
      <DialogActions>
        <Button variant="secondary" onClick={onClose}>
          Cancel
        </Button>
        <Button type="submit" isLoading={create.isPending}>
          Create token
        </Button>
      </DialogActions>
    </form>
  );
}

function TokenShownOnce({ token, onClose }: { token: LabApiTokenCreated; onClose: () => void }) {
  const fieldId = useId();
  return (
    <div>
      <Alert tone="error" title="This is the only time the token is shown">
        Copy it into your middleware’s configuration now. Plumbline keeps only a fingerprint of it: if it is
        lost, revoke it and create a new one. Anyone holding it can send files as your lab.
      </Alert>
      <div className="mt-5 flex flex-col gap-1.5">
        <label htmlFor={fieldId} className="text-sm font-medium text-slate-800">
          Token “{token.name}”
        </label>
        <div className="flex flex-wrap items-center gap-2">
          <input
            id={fieldId}
            readOnly
            autoFocus
            value={token.token}
            onFocus={(event) => event.target.select()}
            className="h-10 min-w-0 flex-1 rounded-md border border-slate-300 bg-slate-50 px-3 font-mono text-xs text-slate-800"
          />
          <CopyButton text={token.token} label="Copy token" />
        </div>
      </div>
      <DialogActions>
        <Button onClick={onClose}>I have copied it</Button>
      </DialogActions>
    </div>
  );
}
