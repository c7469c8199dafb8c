// The Kubernetes manifests in deploy/, validated offline against the Kubernetes API schemas (kubernetes-models and
// its validate package), and checked for what a hospital's platform team asks of a service: probes on /healthz,
// a locked-down securityContext, resources, and a Service, autoscaler and disruption budget that point at the pods.
import { readdirSync, readFileSync } from 'node:fs';
import { parseAllDocuments } from 'yaml';
import { describe, expect, it } from 'vitest';
import { Deployment } from 'kubernetes-models/apps/v1';
import { HorizontalPodAutoscaler } from 'kubernetes-models/autoscaling/v2';
import { ConfigMap, Service } from 'kubernetes-models/v1';
import { PodDisruptionBudget } from 'kubernetes-models/policy/v1';

const dir = new URL('../../deploy/', import.meta.url);
type Doc = Record<string, any>;
const docs: Doc[] = readdirSync(dir)
  .filter((name) => name.endsWith('.yaml'))
  .flatMap((name) =>
    parseAllDocuments(readFileSync(new URL(name, dir), 'utf8')).map((d) => {
      if (d.errors.length) throw new Error(`${name}: ${d.errors[0]!.message}`);
      return d.toJS() as Doc;
    }),
  );
const MODELS: Record<string, new (data: any) => { validate(): void }> = {
  'apps/v1 Deployment': Deployment,
  'v1 Service': Service,
  'v1 ConfigMap': ConfigMap,
  'autoscaling/v2 HorizontalPodAutoscaler': HorizontalPodAutoscaler,
  'policy/v1 PodDisruptionBudget': PodDisruptionBudget,
};
const one = (kind: string) => docs.find((d) => d.kind === kind)!;

describe('deploy/ manifests', () => {
  it('are a Deployment, Service, HorizontalPodAutoscaler, PodDisruptionBudget and ConfigMap, each valid for its API', () => {
    expect(docs.map((d) => d.kind).sort()).toEqual([
      'ConfigMap',
      'Deployment',
      'HorizontalPodAutoscaler',
      'PodDisruptionBudget',
      'Service',
    ]);
    for (const doc of docs) {
      const Model = MODELS[`${doc.apiVersion} ${doc.kind}`];
      expect(Model, `${doc.apiVersion} ${doc.kind}`).toBeDefined();
      expect(() => new Model!(doc).validate(), doc.kind).not.toThrow();
    }
  });

  it('the validator refuses a broken Deployment, so a pass means something', () => {
    const broken = structuredClone(one('Deployment'));
    broken.spec.replicas = 'two';
    delete broken.spec.template.spec.containers[0].name;
    expect(() => new Deployment(broken as any).validate()).toThrow();
  });

  it('probes /healthz on the named port for startup, readiness and liveness', () => {
    const c = one('Deployment').spec.template.spec.containers[0];
    const ports = c.ports.map((p: Doc) => p.name);
    for (const probe of ['startupProbe', 'readinessProbe', 'livenessProbe']) {
      expect(c[probe].httpGet.path, probe).toBe('/healthz');
      expect(ports).toContain(c[probe].httpGet.port);
    }
  });

  it('runs as a non-root user with a read-only root filesystem and every capability dropped, with resources set', () => {
    const pod = one('Deployment').spec.template.spec;
    const c = pod.containers[0];
    expect(pod.securityContext.runAsNonRoot).toBe(true);
    expect(pod.securityContext.runAsUser).toBeGreaterThan(0);
    expect(c.securityContext).toMatchObject({
      runAsNonRoot: true,
      allowPrivilegeEscalation: false,
      readOnlyRootFilesystem: true,
      capabilities: { drop: ['ALL'] },
    });
    expect(c.resources.requests.cpu).toBeTruthy();
    expect(c.resources.requests.memory).toBeTruthy();
    expect(c.resources.limits.memory).toBeTruthy();
    expect(c.image).not.toMatch(/:latest$|^[^:]+$/);
    expect(pod.automountServiceAccountToken).toBe(false);
  });

  it('shares one SMART_COOKIE_KEY from a secret, so that any pod answers a callback', () => {
    const env = one('Deployment').spec.template.spec.containers[0].env as Doc[];
    const key = env.find((e) => e.name === 'SMART_COOKIE_KEY')!;
    expect(key.valueFrom.secretKeyRef).toMatchObject({ name: 'gasline-secrets' });
    expect(env.find((e) => e.name === 'HOST')?.value).toBe('0.0.0.0');
  });

  it('the Service, autoscaler and disruption budget point at the Deployment and its pods', () => {
    const deployment = one('Deployment');
    const labels = deployment.spec.template.metadata.labels;
    const matches = (selector: Doc) => Object.entries(selector).every(([k, v]) => labels[k] === v);
    expect(matches(deployment.spec.selector.matchLabels)).toBe(true);
    const service = one('Service');
    expect(matches(service.spec.selector)).toBe(true);
    expect(deployment.spec.template.spec.containers[0].ports.map((p: Doc) => p.name)).toContain(
      service.spec.ports[0].targetPort,
    );
    const hpa = one('HorizontalPodAutoscaler');
    expect(hpa.spec.scaleTargetRef).toEqual({
      apiVersion: 'apps/v1',
      kind: 'Deployment',
      name: deployment.metadata.name,
    });
    expect(hpa.spec.minReplicas).toBeGreaterThanOrEqual(2);
    const pdb = one('PodDisruptionBudget');
    expect(matches(pdb.spec.selector.matchLabels)).toBe(true);
    expect(pdb.spec.minAvailable).toBeLessThan(hpa.spec.minReplicas);
    const envFrom = deployment.spec.template.spec.containers[0].envFrom[0].configMapRef.name;
    expect(envFrom).toBe(one('ConfigMap').metadata.name);
  });
});
