import { route } from '@/lib/api/handler';
import { createAnalysisSchema } from '@/lib/analyses/contract';
import { createAnalysis, listAnalyses } from '@/lib/data/analyses';

type P = { designId: string };

export const GET = route<P>({}, async ({ user, params }) => ({
  analyses: await listAnalyses(user.id, params.designId),
}));

export const POST = route<P, typeof createAnalysisSchema>({ body: createAnalysisSchema, status: 202 }, async ({ user, params, body }) => ({
  analysis: await createAnalysis(user.id, params.designId, body),
}));
