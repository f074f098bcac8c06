import type { FastifyInstance } from 'fastify';
import type { ZodTypeProvider } from 'fastify-type-provider-zod';
import { z } from 'zod';
import {
  formatUnavailableProblemKind,
  HttpProblem,
  jsonResponse,
  limitProblemKind,
  problemKinds,
} from '../src/http/problem.ts';

const problemTypeSchema = z
  .object({ type: z.string(), title: z.string(), status: z.int(), description: z.string() })
  .meta({ id: 'ProblemType' });

const allTypes = [
  ...Object.entries(problemKinds).map(([status, kind]) => ({ ...kind, status: Number(status) })),
  { ...limitProblemKind, status: 422 },
  { ...formatUnavailableProblemKind, status: 404 },
];

/** GET /problems/{name}: the documentation a problem's `type` URI points at (RFC 9457 §3.1.1). */
export async function problemRoutes(app: FastifyInstance): Promise<void> {
  app.withTypeProvider<ZodTypeProvider>().get(
    '/problems/:name',
    {
      schema: {
        summary: 'What a problem type means',
        tags: ['service'],
        params: z.object({ name: z.string().min(1).max(60) }),
        response: { 200: jsonResponse('The problem type', problemTypeSchema) },
      },
    },
    async (request) => {
      const found = allTypes.find((kind) => kind.type === `/problems/${request.params.name}`);
      if (!found) {
        throw new HttpProblem(404, `no problem type ${request.params.name}`, [
          { field: 'name', message: 'unknown problem type' },
        ]);
      }
      return found;
    },
  );
}
