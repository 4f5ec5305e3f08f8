import { type AdoptionPolicy, defaultAdoptionPolicy } from '@shared/policy';
import type { DataSource, EntityManager } from 'typeorm';

/**
 * The adoption policy a new analysis run is judged under (its report carries the policy and its
 * version). Until the admin-editable, versioned policy exists (governance), this is the default
 * of shared/policy.ts; governance replaces the body with "the newest stored version".
 */
export async function currentAdoptionPolicy(source: DataSource | EntityManager): Promise<AdoptionPolicy> {
  void source;
  return defaultAdoptionPolicy;
}
