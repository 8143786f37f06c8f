import { foundation } from './001-foundation.ts';
import { models } from './002-models.ts';
import { curation } from './003-curation.ts';
import { leanSignals } from './004-lean-signals.ts';
import { erasureGeneration } from './005-erasure-generation.ts';
import { validatedBlend } from './006-validated-blend.ts';
import { tasteGroups } from './007-taste-groups.ts';
import { banScopes } from './008-ban-scopes.ts';
import { itemPictures } from './009-item-pictures.ts';
import { rotationPlans } from './010-rotation-plans.ts';
import type { Migration } from './types.ts';

/**
 * Every schema step, oldest first. Versions are consecutive from 1; `PRAGMA user_version` records the
 * last one applied. Never edit a step that has shipped: add a new one.
 */
export const MIGRATIONS: readonly Migration[] = [foundation, models, curation, leanSignals, erasureGeneration, validatedBlend, tasteGroups, banScopes, itemPictures, rotationPlans];
