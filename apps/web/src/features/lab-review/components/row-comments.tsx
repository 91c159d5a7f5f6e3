// Corrective-action comments of one report row: the list (oldest first), a form to add one, and, while
// the period is not signed, editing or deleting by the author or the lab's supervisor.
import { useId, useState } from 'react';
import { COMMENT_MAX_LENGTH, type Comment } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../utils/format.ts';
import { useCreateComment, useDeleteComment, useUpdateComment } from '../api/comments.ts';
import type { ReportRowRef } from '../api/lab-review-keys.ts';

function CommentItem({ comment, labId, canChange }: { comment: Comment; labId: string; canChange: boolean }) {
  const [editing, setEditing] = useState(false);
  const [text, setText] = useState(comment.body);
  const [deleting, setDeleting] = useState(false);
  const update = useUpdateComment();
  const remove = useDeleteComment();
  return (
    <li className="rounded-md border border-slate-200 bg-white px-4 py-3">
      <p className="text-xs text-slate-600">
        <span className="font-semibold text-slate-900">{comment.author.name}</span> ·{' '}
        <time dateTime={comment.createdAt}>{formatDateTime(comment.createdAt)}</time>
      </p>
      {editing ? (
        <form
          className="mt-2 flex flex-col gap-2"
          onSubmit={(event) => {
            event.preventDefault();
            if (text.trim() === '') return;
            update.mutate(
              { labId, commentId: comment.id, body: text.trim() },
              { onSuccess: () => setEditing(false) },
            );
          }}
        >
          <TextareaField
            label="Edit the comment"
            rows={3}
            maxLength={COMMENT_MAX_LENGTH}
            value={text}
            onChange={(e) => setText(e.target.value)}
          />
          {update.isError ? <Alert tone="error">{errorMessage(update.error)}</Alert> : null}
          <div className="flex gap-2">
            <Button type="submit" size="sm" isLoading={update.isPending}>
              Save
            </Button>
            <Button
              variant="secondary"
              size="sm"
              onClick={() => {
                setEditing(false);
                setText(comment.body);
                update.reset();
              }}
            >
              Cancel
            </Button>
          </div>
        </form>
      ) : (
        <p className="mt-1 text-sm whitespace-pre-line text-slate-900">{comment.body}</p>
      )}
      {canChange && !editing ? (
        <div className="mt-2 flex gap-1">
          <Button variant="ghost" size="xs" onClick={() => setEditing(true)}>
            Edit
          </Button>
          <Button variant="ghost" size="xs" onClick={() => setDeleting(true)}>
            Delete
          </Button>
        </div>
      ) : null}
      <ConfirmDialog
        open={deleting}
        onClose={() => {
          setDeleting(false);
          remove.reset();
        }}
        title="Delete this comment?"
        confirmLabel="Delete"
        tone="danger"
        isPending={remove.isPending}
        error={remove.isError ? errorMessage(remove.error) : null}
        onConfirm={() =>
          remove.mutate(
            { labId, commentId: comment.id },
            {
              onSuccess: () => {
                setDeleting(false);
                showToast('Comment deleted');
              },
            },
          )
        }
      >
        <p>
          The comment by {comment.author.name} is removed from the review. The deletion is kept in the audit
          log.
        </p>
      </ConfirmDialog>
    </li>
  );
}

export function RowComments({
  labId,
  period,
  row,
  comments,
  signed,
  currentUser,
}: {
  labId: string;
  period: string;
  row: ReportRowRef;
  /** This row's comments, oldest first. */
  comments: readonly Comment[];
  /** A signed period: comments can be added but not changed. */
  signed: boolean;
  currentUser: { id: string; role: string };
}) {
  const headingId = useId();
  const [text, setText] = useState('');
  const [missing, setMissing] = useState(false);
  const create = useCreateComment();
  const mayChange = (comment: Comment) =>
    !signed && (comment.author.id === currentUser.id || currentUser.role === 'supervisor');

  return (
    <section aria-labelledby={headingId} className="space-y-3">
      <h2 id={headingId} className="text-lg font-semibold text-plumb-950">
        Corrective action and comments
      </h2>
      {comments.length === 0 ? (
        <p className="text-sm text-slate-600">No comment on this result yet.</p>
      ) : (
        <ol className="space-y-2" aria-label="Comments">
          {comments.map((comment) => (
            <CommentItem key={comment.id} comment={comment} labId={labId} canChange={mayChange(comment)} />
          ))}
        </ol>
      )}
      {signed ? (
        <p className="text-xs text-slate-600">
          The period is signed off: existing comments cannot be changed, new ones can be added.
        </p>
      ) : null}
      <form
        noValidate
        className="flex flex-col gap-2 rounded-lg border border-slate-200 bg-white p-4 shadow-xs"
        onSubmit={(event) => {
          event.preventDefault();
          if (text.trim() === '') {
            setMissing(true);
            return;
          }
          create.mutate(
            { labId, body: { period, ...row, body: text.trim() } },
            {
              onSuccess: () => {
                setText('');
                showToast('Comment saved');
              },
            },
          );
        }}
      >
        <TextareaField
          label="Add a corrective-action comment"
          hint="What you found and what you did, e.g. recalibrated, changed reagent lot, repeated controls."
          rows={3}
          maxLength={COMMENT_MAX_LENGTH}
          value={text}
          error={missing ? 'write the comment' : undefined}
          onChange={(event) => {
            setText(event.target.value);
            setMissing(false);
          }}
        />
        {create.isError ? <Alert tone="error">{errorMessage(create.error)}</Alert> : null}
        <div>
          <Button type="submit" isLoading={create.isPending}>
            Save comment
          </Button>
        </div>
      </form>
    </section>
  );
}
