import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/Button';
import { Field } from '../../../components/ui/Field';
import { ErrorNote } from '../../../components/ui/Notice';
import { formResolver } from '../../../lib/forms/resolver';
import { showServerErrors } from '../../../lib/forms/server-errors';
import { useCreateFollow, type FollowTarget } from '../api/create-follow';
import { DEFAULT_THRESHOLD_VALUES, thresholdsFormSchema } from '../forms/thresholds';

const input = 'w-20 rounded border border-paper-edge bg-white/70 px-2 py-1 text-right tabular-nums';

/** Follow what the page shows, with the two thresholds (defaults are common practice). */
export function FollowForm({ target, what }: { target: FollowTarget; what: 'synthesis' | 'snapshot' }) {
  const follow = useCreateFollow();
  const form = useForm({ resolver: formResolver(thresholdsFormSchema), defaultValues: DEFAULT_THRESHOLD_VALUES });
  const { errors } = form.formState;
  const done = follow.data;
  return (
    <form
      className="flex flex-wrap items-end gap-3"
      noValidate
      aria-label={`Follow this ${what}`}
      onSubmit={form.handleSubmit((v) => follow.mutate({ ...target, ...v }, { onError: (err) => showServerErrors(err, form.setError, ['seShare']) }))}
    >
      <Field label="Tell me when the estimate moves by more than (× its SE)" hint="0.5 is common practice" error={errors.seShare?.message} className="flex flex-col text-sm" labelClassName="font-semibold">
        <input {...form.register('seShare')} inputMode="decimal" className={input} />
      </Field>
      <Field label="or a new study carries more than (% of the weight)" hint="20% is common practice" error={errors.weightPercent?.message} className="flex flex-col text-sm" labelClassName="font-semibold">
        <input {...form.register('weightPercent')} inputMode="decimal" className={input} />
      </Field>
      <Button type="submit" variant="primary" disabled={follow.isPending}>
        {follow.isPending ? 'Following…' : `Follow this ${what}`}
      </Button>
      {done && (
        <p role="status" className="text-sm">
          ✓ Following: the estimate moving by {done.seShare.toFixed(2)} SE or a new study over {(done.weightShare * 100).toFixed(0)}% of the weight is news
          (at most one mail a day). <Link to="/follows">My follows</Link> · <a href={done.feedUrl}>Atom feed</a>
        </p>
      )}
      <ErrorNote error={follow.error} title="Not followed" />
    </form>
  );
}
