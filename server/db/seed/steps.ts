import type { SeedStep } from './demo';
import { ingredientsSeedStep } from './ingredients';
import { recipesSeedStep } from './recipes';
import { batchesSeedStep } from './batches';
import { holdingSeedStep } from './holding';
import { cleaningSeedStep } from './cleaning';
import { documentsSeedStep } from './documents';
import { labelsSeedStep } from './labels';
import { salesSeedStep } from './sales';
import { recallsSeedStep } from './recalls';

// Feature seed steps in dependency order (ingredients before recipes before batches, ...).
// Each feature adds one import and one entry here.
export const DEMO_STEPS: SeedStep[] = [ingredientsSeedStep, recipesSeedStep, batchesSeedStep, holdingSeedStep, cleaningSeedStep, labelsSeedStep, documentsSeedStep, salesSeedStep, recallsSeedStep];
