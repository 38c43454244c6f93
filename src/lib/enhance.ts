import type { SubmitFunction } from '@sveltejs/kit';
import { tick } from 'svelte';

/**
 * `use:enhance={focusFirstError}`: after a refused submission, moves focus to the first field
 * marked invalid (or the form's alert), so keyboard and screen-reader users land on the problem.
 * Passwords the server refused are cleared.
 */
export const focusFirstError: SubmitFunction = ({ formElement }) => {
	return async ({ update, result }) => {
		await update({ reset: result.type === 'success' });
		if (result.type !== 'failure') return;
		for (const input of formElement.querySelectorAll<HTMLInputElement>('input[type=password]')) input.value = '';
		await tick();
		const target = formElement.querySelector<HTMLElement>('[aria-invalid="true"]') ?? formElement.querySelector<HTMLElement>('[role="alert"]');
		if (target && !target.matches('input, select, textarea, button')) target.tabIndex = -1;
		target?.focus();
	};
};
