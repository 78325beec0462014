/** The tool's version, written into every file it produces. Keep in step with package.json. */
export const TOOL_NAME = 'pumpscribe';
export const TOOL_VERSION = '0.1.0';
