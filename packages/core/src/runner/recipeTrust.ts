import { RunFolderError } from './errors.js';
import type { ResolvedTargetRecipe } from './targetRecipe.js';

/**
 * Packages whose exports a run folder's recipe may name without the user confirming
 * the module: apsis's own packages, which evaluate no code from the folder.
 */
export const trustedRecipePackages: readonly string[] = ['@apsis/core', '@apsis/models'];

/** True when `module` is one of {@link trustedRecipePackages} or a subpath of one. */
export function isTrustedRecipeModule(module: string): boolean {
  return trustedRecipePackages.some((p) => module === p || module.startsWith(`${p}/`));
}

/**
 * The recipe to rebuild a run's target from, given what the user supplied.
 *
 * A run folder is untrusted input, and importing a module runs its code. So the
 * module named in a manifest is used only when it is a trusted apsis package;
 * otherwise the user must name the module themselves (`module`, e.g. from the command
 * line), and only the export name and the JSON arguments are taken from the folder
 * (arguments are data handed to the user's own factory, never evaluated).
 */
export function recipeForResume(stored: ResolvedTargetRecipe | null, module: string | null, exportName: string | null): ResolvedTargetRecipe {
  if (stored === null) {
    if (module === null) {
      throw new RunFolderError(
        'this run was made with an in-memory target (no recipe was recorded): pass the target to resumeRun({ target }), or a module and export name to rebuild it',
      );
    }
    return { module, exportName: exportName ?? 'default', args: null };
  }
  if (module !== null) return { module, exportName: exportName ?? stored.exportName, args: stored.args };
  if (!isTrustedRecipeModule(stored.module)) {
    throw new RunFolderError(
      `this run's target comes from module ${JSON.stringify(stored.module)}, which is not an apsis package; a run folder is not trusted to choose code to run, so name the module yourself (command line: --module <path>; library: resumeRun(folder, { target: { module, exportName, args } }))`,
    );
  }
  return { ...stored, exportName: exportName ?? stored.exportName };
}
