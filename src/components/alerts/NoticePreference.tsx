import { useMutation } from '@tanstack/react-query';
import { useState } from 'react';
import { fetchJson } from '../../lib/query/client';
import { withQuery } from '../../lib/query/provider';

/** A householder's switch for plain-language notices by e-mail. */
function NoticePreference({ initial }: { initial: boolean }) {
  const [on, setOn] = useState(initial);
  const save = useMutation({
    mutationFn: (v: boolean) =>
      fetchJson<{ householderNotices: boolean }>('/api/alerts/preferences', {
        method: 'PUT',
        body: JSON.stringify({ householderNotices: v }),
      }),
    onSuccess: (r) => setOn(r.householderNotices),
  });
  return (
    <div className="card space-y-3">
      <label className="flex items-center gap-3">
        <input type="checkbox" checked={on} disabled={save.isPending} onChange={(e) => save.mutate(e.target.checked)} />
        <span>
          E-mail me when my hot water needs attention (not getting hot enough, running short, or costing more than it
          should)
        </span>
      </label>
      <p role="status" className="text-sm text-ink-soft">
        {on ? 'You will receive these notices.' : 'You will not receive these notices. Your installer is still told.'}
      </p>
      {save.isError && (
        <p role="alert" className="text-sm text-brick">
          Could not save your choice; please try again.
        </p>
      )}
    </div>
  );
}

export default withQuery(NoticePreference);
