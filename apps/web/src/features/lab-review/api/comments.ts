// Corrective-action comments on report rows: write one (also after sign-off), edit or delete one
// (only while the period is not signed; the API answers 409 after).
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { commentSchema, type CommentCreate } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { labReviewKeys } from './lab-review-keys.ts';

export function createComment({ labId, body }: { labId: string; body: CommentCreate }) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/comments`, {
    method: 'POST',
    body,
    schema: commentSchema,
  });
}

export function updateComment({
  labId,
  commentId,
  body,
}: {
  labId: string;
  commentId: string;
  body: string;
}) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/comments/${encodeURIComponent(commentId)}`, {
    method: 'PATCH',
    body: { body },
    schema: commentSchema,
  });
}

export function deleteComment({ labId, commentId }: { labId: string; commentId: string }) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/comments/${encodeURIComponent(commentId)}`, {
    method: 'DELETE',
  });
}

function useInvalidateComments() {
  const queryClient = useQueryClient();
  return (labId: string) => queryClient.invalidateQueries({ queryKey: labReviewKeys.commentLists(labId) });
}

export function useCreateComment() {
  const invalidate = useInvalidateComments();
  return useMutation({ mutationFn: createComment, onSuccess: (_c, { labId }) => invalidate(labId) });
}

export function useUpdateComment() {
  const invalidate = useInvalidateComments();
  return useMutation({ mutationFn: updateComment, onSuccess: (_c, { labId }) => invalidate(labId) });
}

export function useDeleteComment() {
  const invalidate = useInvalidateComments();
  return useMutation({ mutationFn: deleteComment, onSuccess: (_r, { labId }) => invalidate(labId) });
}
