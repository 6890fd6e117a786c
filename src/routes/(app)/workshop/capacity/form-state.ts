/** What a failed action of this page returns; each form shows only its own. */
export interface FormState {
	action?: string;
	errors?: Record<string, string>;
	values?: Record<string, string>;
	message?: string;
}

/** The errors, typed values and message of one form, or empty when another form failed. */
export function formPart(form: FormState | null | undefined, action: string) {
	const mine = form?.action === action;
	return {
		mine,
		errors: mine ? (form?.errors ?? {}) : {},
		message: mine ? form?.message : undefined,
		value: (key: string, fallback: string) => (mine ? (form?.values?.[key] ?? '') : fallback)
	};
}
