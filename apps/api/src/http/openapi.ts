import { OpenAPIRegistry, OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi';

export function createRegistry(): OpenAPIRegistry {
  return new OpenAPIRegistry();
}

export function buildOpenApiDocument(registry: OpenAPIRegistry, version: string): ReturnType<OpenApiGeneratorV31['generateDocument']> {
  const generator = new OpenApiGeneratorV31(registry.definitions);
  return generator.generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Phaseloop API',
      version,
      description:
        'Calibrate nitinol material models, run studies and review results. Sessions are cookie based: ' +
        'sign in with POST /api/auth/login. Results support, and never replace, physical testing.',
    },
    servers: [{ url: '/' }],
  });
}
