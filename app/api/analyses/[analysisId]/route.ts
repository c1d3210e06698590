import { route } from '@/lib/api/handler';
import { cancelAnalysis, getAnalysis } from '@/lib/data/analyses';

type P = { analysisId: string };

export const GET = route<P>({}, async ({ user, params }) => ({
  analysis: await getAnalysis(user.id, params.analysisId),
}));

/** Cancel a queued or running analysis. */
export const DELETE = route<P>({}, async ({ user, params }) => ({
  analysis: await cancelAnalysis(user.id, params.analysisId),
}));
