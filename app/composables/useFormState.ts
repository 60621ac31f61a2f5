// Loading flag, form message and field messages for one form.
export function useFormState() {
  const pending = ref(false)
  const message = ref('')
  const fields = ref<Record<string, string>>({})

  async function submit<T>(action: () => Promise<T>): Promise<T | undefined> {
    pending.value = true
    message.value = ''
    fields.value = {}
    try {
      return await action()
    }
    catch (error) {
      const problem = apiProblem(error)
      message.value = problem.message
      fields.value = problem.fields
      return undefined
    }
    finally {
      pending.value = false
    }
  }

  return { pending, message, fields, submit }
}
