/**
 * The Jupyter widget-state document (format 2.0) that carries every quietframe state: in state
 * files, in pages, and in notebook metadata. Each kind's state is one model of module "quietframe".
 */
export const WIDGET_MODULE = "quietframe";

/** Key of the widget state in notebook metadata and the media type of state files. */
export const WIDGET_STATE_MIME = "application/vnd.jupyter.widget-state+json";

/** Jupyter widget state, format 2.0, as stored in notebook metadata and state files. */
export interface JupyterWidgetStateDocument {
  version_major: 2;
  version_minor: 0;
  state: Record<
    string,
    {
      model_name: string;
      model_module: string;
      model_module_version: string;
      state: Record<string, unknown>;
    }
  >;
}
