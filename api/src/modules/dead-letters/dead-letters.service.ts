import type { DeadLetterPage, DeadLetterQuery } from '../../../../shared/schemas/dead-letters.ts';
import { deadLettersRepository as repo } from './dead-letters.repository.ts';

export const deadLettersService = {
  async page(q: DeadLetterQuery, retentionDays: number): Promise<DeadLetterPage> {
    const [deadLetters, conflicts, counts] = await Promise.all([repo.list(q), repo.conflicts(q), repo.counts(q)]);
    return { deadLetters, conflicts, counts, retention: { deadLetterDays: retentionDays } };
  },
};
