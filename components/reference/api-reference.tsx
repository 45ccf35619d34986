import { useQuery } from '@tanstack/react-query';
import { createElement, useState } from 'react';
import { Platform, View } from 'react-native';

import { space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Choice } from '@/components/ui/choice';
import { QueryState } from '@/components/ui/query-state';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';

type Schema = {
  type?: string | string[];
  properties?: Record<string, Schema>;
  required?: string[];
  items?: Schema;
  enum?: unknown[];
  anyOf?: Schema[];
  oneOf?: Schema[];
  format?: string;
  pattern?: string;
  minimum?: number;
  maximum?: number;
  const?: unknown;
};
type Operation = {
  summary: string;
  description: string;
  parameters: { name: string; in: string; required: boolean; schema: Schema }[];
  requestBody?: { content: Record<string, { schema: Schema }> };
  responses: Record<string, unknown>;
  tags: string[];
};

/** A schema in a line a reader can follow: "number 0–100", "one of fm, tv", "array of …". */
export function describeSchema(s: Schema | undefined): string {
  if (!s) return 'any';
  if (s.const !== undefined) return JSON.stringify(s.const);
  if (s.enum) return `one of ${s.enum.map(String).join(', ')}`;
  const alt = s.anyOf ?? s.oneOf;
  if (alt) return alt.map(describeSchema).join(' or ');
  const type = Array.isArray(s.type) ? s.type.join(' or ') : (s.type ?? 'object');
  if (type === 'array') return `array of ${describeSchema(s.items)}`;
  const range = s.minimum != null || s.maximum != null ? ` ${s.minimum ?? '…'}–${s.maximum ?? '…'}` : '';
  return `${type}${s.format ? ` (${s.format})` : ''}${range}`;
}

function Fields({ schema }: { schema: Schema }) {
  const props = schema.properties ?? schema.anyOf?.[0]?.properties;
  if (!props) return <Text variant="small">{describeSchema(schema)}</Text>;
  const required = new Set(schema.required ?? schema.anyOf?.[0]?.required ?? []);
  return (
    <View style={{ gap: 2 }}>
      {Object.entries(props).map(([k, v]) => (
        <Text key={k} variant="small">
          <Text strong variant="small">
            {k}
          </Text>
          {required.has(k) ? '' : ' (optional)'}: {describeSchema(v)}
        </Text>
      ))}
    </View>
  );
}

function OpenApi() {
  const doc = useQuery({
    queryKey: ['openapi'],
    staleTime: Infinity,
    queryFn: async () =>
      (await fetch('/api/openapi.json')).json() as Promise<{
        info: { version: string; description: string };
        paths: Record<string, Record<string, Operation>>;
      }>,
  });
  return (
    <QueryState query={doc}>
      {(d) => {
        const ops = Object.entries(d.paths).flatMap(([path, m]) =>
          Object.entries(m).map(([method, op]) => ({ path, method, op })),
        );
        const tags = [...new Set(ops.map((o) => o.op.tags[0]))];
        return (
          <View style={{ gap: space.md }}>
            <Text>{d.info.description}</Text>
            <Text variant="small" muted>
              Version {d.info.version}. {ops.length} routes. Paths are under /api.
            </Text>
            {tags.map((tag) => (
              <Card key={tag}>
                <Text variant="title" role="heading" aria-level={2}>
                  {tag}
                </Text>
                {ops
                  .filter((o) => o.op.tags[0] === tag)
                  .map(({ path, method, op }) => (
                    <View
                      key={`${method} ${path}`}
                      style={{ gap: space.xs, paddingVertical: space.xs }}
                      aria-label={`${method.toUpperCase()} ${path}`}
                    >
                      <View style={{ flexDirection: 'row', gap: space.sm, flexWrap: 'wrap', alignItems: 'center' }}>
                        <Badge label={method.toUpperCase()} />
                        <Text strong style={{ fontFamily: 'monospace' }}>
                          /api{path}
                        </Text>
                      </View>
                      <Text>{op.summary}</Text>
                      <Text variant="small" muted>
                        {op.description} Answers: {Object.keys(op.responses).join(', ')}.
                      </Text>
                      {op.parameters.length ? (
                        <Text variant="small">
                          Parameters:{' '}
                          {op.parameters
                            .map(
                              (p) =>
                                `${p.name} (${p.in}${p.required ? '' : ', optional'}): ${describeSchema(p.schema)}`,
                            )
                            .join(' · ')}
                        </Text>
                      ) : null}
                      {op.requestBody
                        ? Object.entries(op.requestBody.content).map(([type, c]) => (
                            <View key={type} style={{ gap: 2 }}>
                              <Text variant="small" strong>
                                Body ({type})
                              </Text>
                              <Fields schema={c.schema} />
                            </View>
                          ))
                        : null}
                    </View>
                  ))}
              </Card>
            ))}
          </View>
        );
      }}
    </QueryState>
  );
}

function AsyncApi() {
  const doc = useQuery({
    queryKey: ['asyncapi'],
    staleTime: Infinity,
    queryFn: async () =>
      (await fetch('/api/asyncapi.json')).json() as Promise<{
        info: { version: string; description: string };
        servers: Record<string, { host: string; protocol: string; pathname?: string }>;
        channels: Record<string, { address: string; messages: Record<string, { $ref: string }> }>;
        operations: Record<string, { action: string; summary: string; channel: { $ref: string } }>;
        components: { messages: Record<string, { title: string; payload: Schema }> };
      }>,
  });
  return (
    <QueryState query={doc}>
      {(d) => (
        <View style={{ gap: space.md }}>
          {d.info.description.split('\n\n').map((p, i) => (
            <Text key={i}>{p.replace(/\*\*/g, '')}</Text>
          ))}
          <Card>
            <Text variant="title" role="heading" aria-level={2}>
              Broker
            </Text>
            {Object.entries(d.servers).map(([k, s]) => (
              <Text key={k}>
                {s.protocol}://{s.host}
                {s.pathname ?? ''}
              </Text>
            ))}
          </Card>
          {Object.entries(d.operations).map(([name, op]) => {
            const channel = op.channel.$ref.split('/').pop()!;
            const ref = Object.values(d.channels[channel].messages)[0]?.$ref.split('/').pop();
            const message = ref ? d.components.messages[ref] : undefined;
            return (
              <Card key={name}>
                <View style={{ flexDirection: 'row', gap: space.sm, flexWrap: 'wrap', alignItems: 'center' }}>
                  <Badge label={op.action === 'send' ? 'Controller publishes' : 'Controller receives'} />
                  <Text strong style={{ fontFamily: 'monospace' }}>
                    {d.channels[channel].address}
                  </Text>
                </View>
                <Text>{op.summary}</Text>
                {message ? <Fields schema={message.payload} /> : null}
              </Card>
            );
          })}
        </View>
      )}
    </QueryState>
  );
}

/** The REST API and the MQTT contract, rendered from the documents the server generates. */
export function ApiReference() {
  const [which, setWhich] = useState<'rest' | 'mqtt'>('rest');
  return (
    <View style={{ gap: space.md }}>
      <Choice
        label="Document"
        value={which}
        onChange={setWhich}
        options={[
          { value: 'rest', label: 'REST API (OpenAPI 3.1)' },
          { value: 'mqtt', label: 'Controllers over MQTT (AsyncAPI 3)' },
        ]}
      />
      {Platform.OS === 'web' ? (
        <Text variant="small">
          Machine-readable:{' '}
          {createElement(
            'a',
            { href: which === 'rest' ? '/api/openapi.json' : '/api/asyncapi.json' },
            which === 'rest' ? '/api/openapi.json' : '/api/asyncapi.json',
          )}
        </Text>
      ) : null}
      {which === 'rest' ? <OpenApi /> : <AsyncApi />}
    </View>
  );
}
