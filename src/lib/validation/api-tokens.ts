import { z } from 'zod';
import { requiredText } from './helpers';

export const apiTokenNameSchema = z.object({ name: requiredText(80, 'Token name') });
export type ApiTokenNameInput = z.infer<typeof apiTokenNameSchema>;
