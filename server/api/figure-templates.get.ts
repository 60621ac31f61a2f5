import { templateCatalogue } from '../services/figures'

export default defineEventHandler(() => ({ templates: templateCatalogue() }))
