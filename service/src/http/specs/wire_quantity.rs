#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize, utoipa::ToSchema)]
pub struct Quantity {
    pub value: f64,
    pub unit: String,
}
