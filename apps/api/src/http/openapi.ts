import { OpenAPIRegistry, OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi';

export function createRegistry(): OpenAPIRegistry {
  return new OpenAPIRegistry();
}

/** How scripts authenticate: shown in the description's text and declared as a security scheme. */
const TOKEN_EXAMPLE = [
  '',
  '',
  '## Scripting with an API token',
  'Create a personal token in the app (or `POST /api/tokens` while signed in); it is shown once.',
  'Send it as a bearer token; token requests need no CSRF header. For example, queue a run of a',
  'study and fetch its history when it has finished:',
  '',
  '```sh',
  'export PHASELOOP_TOKEN=plt_...',
  'curl -X POST -H "Authorization: Bearer $PHASELOOP_TOKEN" https://phaseloop.example/api/studies/<study-id>/runs',
  'curl -H "Authorization: Bearer $PHASELOOP_TOKEN" https://phaseloop.example/api/runs/<run-id>',
  'curl -H "Authorization: Bearer $PHASELOOP_TOKEN" -o history.csv https://phaseloop.example/api/runs/<run-id>/results/history.csv',
  '```',
  'Revoke a token with `DELETE /api/tokens/<id>`. Tokens cannot manage tokens or sessions.',
].join('\n');

export function buildOpenApiDocument(registry: OpenAPIRegistry, version: string): ReturnType<OpenApiGeneratorV31['generateDocument']> {
  registry.registerComponent('securitySchemes', 'apiToken', { type: 'http', scheme: 'bearer', description: 'Personal API token (plt_…)' });
  registry.registerComponent('securitySchemes', 'session', { type: 'apiKey', in: 'cookie', name: 'phaseloop.sid', description: 'Browser session (sign in with POST /api/auth/login); writes need the x-csrf-token header' });
  const generator = new OpenApiGeneratorV31(registry.definitions);
  return generator.generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Phaseloop API',
      version,
      description:
        'Calibrate nitinol material models, run studies and review results. Sessions are cookie based: ' +
        'sign in with POST /api/auth/login. Results support, and never replace, physical testing.' + TOKEN_EXAMPLE,
    },
    servers: [{ url: '/' }],
    security: [{ session: [] }, { apiToken: [] }],
  });
}
