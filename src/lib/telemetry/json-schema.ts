// The wire contract as JSON Schema (draft 2020-12), generated from the zod schemas so that
// docs/wire-contract.schema.json cannot drift from what the code accepts (a unit test compares them).
import { z } from '@/lib/zod';
import { batchSchema, commandMessageSchema, commandReplySchema, commandRequestSchema, readingSchema } from './wire';

export function wireJsonSchema(): Record<string, unknown> {
  const one = (s: z.ZodType) => {
    const { $schema: _drop, ...rest } = z.toJSONSchema(s, { io: 'input', unrepresentable: 'any' }) as Record<
      string,
      unknown
    >;
    return rest;
  };
  return {
    $schema: 'https://json-schema.org/draft/2020-12/schema',
    $id: 'https://heatlayer.example.com/schemas/wire-contract-v1.json',
    title: 'Heatlayer tank wire contract v1',
    description:
      'Payloads on heatlayer/v1/tanks/{serial}/telemetry (a reading or a batch), /commands, /replies, and the body of POST /api/ingest. See docs/wire-contract.md.',
    $defs: {
      reading: one(readingSchema),
      batch: {
        ...one(batchSchema),
        properties: {
          ...(one(batchSchema).properties as object),
          readings: { type: 'array', minItems: 1, maxItems: 1000, items: { $ref: '#/$defs/reading' } },
        },
      },
      commandRequest: one(commandRequestSchema),
      commandMessage: one(commandMessageSchema),
      commandReply: one(commandReplySchema),
      status: {
        type: 'string',
        enum: ['online', 'offline'],
        description: "Plain text, retained; the device's last will says offline.",
      },
    },
    oneOf: [{ $ref: '#/$defs/reading' }, { $ref: '#/$defs/batch' }],
  };
}
