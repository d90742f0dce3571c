// The models `layline fit --model NAME` knows. Add a model by writing its FitModelAdapter in
// its own module and listing it here.
import type { FitModelAdapter } from './fit-model';
import { groupedFitModel } from './grouped-fit-model';

export const fitModels: readonly FitModelAdapter[] = [groupedFitModel];
