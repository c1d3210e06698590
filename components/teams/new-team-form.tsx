'use client';

import { useRouter } from 'next/navigation';
import { useState, type FormEvent } from 'react';
import { Button, ButtonLink } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice, Panel } from '@/components/ui/notice';
import { fieldError, formError } from '@/lib/client/api';
import { useCreateTeam } from '@/lib/client/hooks';

/** Creates a team (the creator becomes its owner) and opens it. */
export function NewTeamForm() {
  const router = useRouter();
  const create = useCreateTeam();
  const [name, setName] = useState('');

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    create.mutate({ name }, { onSuccess: (res) => router.push(`/teams/${res.team.id}`) });
  }

  return (
    <div className="max-w-lg space-y-4">
      <h1 className="text-2xl font-semibold text-ink-50">New team</h1>
      <Panel>
        <form onSubmit={onSubmit} className="space-y-4" data-testid="new-team-form" noValidate>
          {formError(create.error, ['name']) ? <Notice tone="error">{formError(create.error, ['name'])}</Notice> : null}
          <TextField
            label="Team name"
            name="name"
            required
            maxLength={80}
            value={name}
            onChange={(e) => setName(e.target.value)}
            disabled={create.isPending}
            error={fieldError(create.error, 'name')}
            hint="You will be its owner and can invite colleagues next."
          />
          <div className="flex gap-2">
            <Button type="submit" pending={create.isPending} pendingLabel="Creating…" data-testid="new-team-submit">
              Create team
            </Button>
            <ButtonLink href="/teams" variant="ghost">
              Cancel
            </ButtonLink>
          </div>
        </form>
      </Panel>
    </div>
  );
}
