import { ref } from 'vue';
import { apiDownload, errorText, type QueryValue } from '@/api/http';

/**
 * Downloads a list as CSV: the list's own address and filters with `format=csv`. While it runs
 * `busy` is true; a refusal (too many rows, signed out) comes back as `problem` in words.
 */
export function useCsvDownload() {
  const busy = ref(false);
  const problem = ref('');

  async function download(path: string, query: Record<string, QueryValue>, fallbackName: string): Promise<boolean> {
    busy.value = true;
    problem.value = '';
    try {
      const file = await apiDownload(
        path,
        { ...query, limit: undefined, offset: undefined, cursor: undefined, format: 'csv' },
        fallbackName,
      );
      const url = URL.createObjectURL(file.blob);
      const link = document.createElement('a');
      link.href = url;
      link.download = file.filename;
      link.rel = 'noopener';
      document.body.appendChild(link);
      link.click();
      link.remove();
      // The browser has taken the file once the click is handled; free the memory a little later.
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
      return true;
    } catch (err) {
      problem.value = errorText(err);
      return false;
    } finally {
      busy.value = false;
    }
  }

  return { busy, problem, download };
}
